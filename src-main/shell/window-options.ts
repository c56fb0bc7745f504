import type { BrowserWindowConstructorOptions, Rectangle } from 'electron';

/** The one window's options: hardened web preferences, restored bounds, devtools only in development. */
export interface WindowOptionsInput {
  bounds: Rectangle;
  preloadPath: string;
  development: boolean;
}

export const MIN_WIDTH = 960;
export const MIN_HEIGHT = 640;

export function windowOptions(input: WindowOptionsInput): BrowserWindowConstructorOptions {
  return {
    ...input.bounds,
    minWidth: MIN_WIDTH,
    minHeight: MIN_HEIGHT,
    title: 'Holdfast',
    backgroundColor: '#FAF8F4',
    show: false,
    webPreferences: {
      preload: input.preloadPath,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      experimentalFeatures: false,
      webviewTag: false,
      navigateOnDragDrop: false,
      safeDialogs: true,
      spellcheck: false,
      devTools: input.development,
    },
  };
}

import type { MenuItemConstructorOptions } from 'electron';

/**
 * The application menu with the platform's usual shortcuts (CmdOrCtrl is Cmd on macOS, Ctrl
 * elsewhere). Commands the page carries out are sent to it as menu events; undo, redo and the
 * clipboard use Electron's built-in roles so text fields behave as everywhere else.
 */
export const menuActions = ['new-scenario', 'save-revision', 'import-prices', 'print-memo', 'undo', 'redo'] as const;
export type MenuAction = (typeof menuActions)[number];

export interface MenuHandlers {
  /** Sends the action to the page (the renderer decides what it means on the current screen). */
  send(action: MenuAction): void;
  quit(): void;
  about(): void;
}

export function menuTemplate(
  platform: NodeJS.Platform,
  handlers: MenuHandlers,
  options: { development: boolean },
): MenuItemConstructorOptions[] {
  const mac = platform === 'darwin';
  const item = (label: string, accelerator: string, action: MenuAction): MenuItemConstructorOptions => ({
    label,
    accelerator,
    click: () => handlers.send(action),
  });
  const template: MenuItemConstructorOptions[] = [];
  if (mac)
    template.push({
      label: 'Holdfast',
      submenu: [
        { label: 'About Holdfast', click: handlers.about },
        { type: 'separator' },
        { role: 'hide' },
        { role: 'hideOthers' },
        { role: 'unhide' },
        { type: 'separator' },
        { label: 'Quit Holdfast', accelerator: 'Cmd+Q', click: handlers.quit },
      ],
    });
  template.push({
    label: '&File',
    submenu: [
      item('New Scenario', 'CmdOrCtrl+N', 'new-scenario'),
      item('Import Prices…', 'CmdOrCtrl+I', 'import-prices'),
      { type: 'separator' },
      item('Save Revision…', 'CmdOrCtrl+S', 'save-revision'),
      item('Print Memo…', 'CmdOrCtrl+P', 'print-memo'),
      ...(mac
        ? []
        : ([{ type: 'separator' }, { label: 'E&xit', accelerator: 'Ctrl+Q', click: handlers.quit }] as const)),
    ],
  });
  template.push({
    label: '&Edit',
    submenu: [
      { label: 'Undo', accelerator: 'CmdOrCtrl+Z', click: () => handlers.send('undo') },
      { label: 'Redo', accelerator: mac ? 'Shift+Cmd+Z' : 'Ctrl+Y', click: () => handlers.send('redo') },
      { type: 'separator' },
      { role: 'cut' },
      { role: 'copy' },
      { role: 'paste' },
      { role: 'selectAll' },
    ],
  });
  template.push({
    label: '&View',
    submenu: [
      { role: 'resetZoom' },
      { role: 'zoomIn' },
      { role: 'zoomOut' },
      { type: 'separator' },
      { role: 'togglefullscreen' },
      ...(options.development
        ? ([{ type: 'separator' }, { role: 'reload' }, { role: 'toggleDevTools' }] as const)
        : []),
    ],
  });
  template.push({ label: '&Window', submenu: [{ role: 'minimize' }, ...(mac ? [{ role: 'zoom' as const }] : [])] });
  if (!mac) template.push({ label: '&Help', submenu: [{ label: 'About Holdfast', click: handlers.about }] });
  return template;
}

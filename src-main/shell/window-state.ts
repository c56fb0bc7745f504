import type { Rectangle } from 'electron';

/**
 * Restoring the window where the advisor left it: the saved bounds if they still overlap a
 * display's work area enough to grab the title bar, else a default size centred on the primary
 * display (a monitor may have been unplugged since).
 */
export interface SavedWindowState {
  bounds: Rectangle;
  maximized: boolean;
}

export const DEFAULT_SIZE = { width: 1360, height: 860 };
const VISIBLE = 120;

function overlap(a: Rectangle, b: Rectangle): { width: number; height: number } {
  return {
    width: Math.min(a.x + a.width, b.x + b.width) - Math.max(a.x, b.x),
    height: Math.min(a.y + a.height, b.y + b.height) - Math.max(a.y, b.y),
  };
}

export function restoreBounds(saved: SavedWindowState | undefined, workAreas: readonly Rectangle[]): SavedWindowState {
  const primary = workAreas[0] ?? { x: 0, y: 0, width: DEFAULT_SIZE.width, height: DEFAULT_SIZE.height };
  if (saved) {
    const b = saved.bounds;
    const titleBar = { x: b.x, y: b.y, width: b.width, height: 40 };
    const onScreen = workAreas.some((area) => {
      const o = overlap(titleBar, area);
      return o.width >= VISIBLE && o.height > 0;
    });
    if (onScreen && b.width > 0 && b.height > 0) return saved;
  }
  const width = Math.min(DEFAULT_SIZE.width, primary.width);
  const height = Math.min(DEFAULT_SIZE.height, primary.height);
  return {
    bounds: {
      x: primary.x + Math.round((primary.width - width) / 2),
      y: primary.y + Math.round((primary.height - height) / 2),
      width,
      height,
    },
    maximized: false,
  };
}

/** Parses the saved JSON; anything malformed counts as "nothing saved". */
export function parseWindowState(text: string | undefined): SavedWindowState | undefined {
  if (!text) return undefined;
  try {
    const v = JSON.parse(text) as SavedWindowState;
    const b = v?.bounds;
    const ok = b && [b.x, b.y, b.width, b.height].every((n) => Number.isInteger(n)) && typeof v.maximized === 'boolean';
    return ok ? { bounds: { x: b.x, y: b.y, width: b.width, height: b.height }, maximized: v.maximized } : undefined;
  } catch {
    return undefined;
  }
}

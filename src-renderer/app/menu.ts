import { useEffect, useRef } from 'react';
import type { HoldfastPreload } from '../bridge.js';

/**
 * Commands from the desktop window's menu. The shell sends each as a plain string on one
 * channel and the preload hands it to `window.holdfast.onMenu`; the page decides what it means on
 * the current screen. The list mirrors `menuActions` in src-main/shell/app-menu.ts (which the
 * renderer cannot import: it is typed against Electron and Node); a unit test keeps the two equal.
 *
 * In the local web host there is no preload and nothing subscribes; the pages' own keyboard
 * shortcuts work there as everywhere.
 */
export const MENU_ACTIONS = ['new-scenario', 'save-revision', 'import-prices', 'print-memo', 'undo', 'redo'] as const;
export type MenuAction = (typeof MENU_ACTIONS)[number];

export function isMenuAction(value: unknown): value is MenuAction {
  return typeof value === 'string' && (MENU_ACTIONS as readonly string[]).includes(value);
}

/**
 * A menu shortcut may reach the page twice: as the key press the page handles itself and as the
 * menu command the shell sends for the same keys, in either order. Whichever comes second within
 * this time of the first, for the same action, is taken as its echo and dropped.
 */
export const KEYBOARD_ECHO_MS = 400;

type Handler = () => void;

export interface MenuRouter {
  /**
   * Makes `handler` the one that answers `action` until the returned function is called; the
   * latest registration wins (a page's own handler over the app's default), and removing it
   * gives the action back to the one before.
   */
  register(action: MenuAction, handler: Handler): () => void;
  /** Subscribes to the preload's menu events, if there is a preload that offers them. */
  connect(preload: HoldfastPreload | undefined): () => void;
  /**
   * The page is about to carry out `action` from its own keyboard shortcut: false when the menu
   * has just done it (the same key press seen twice), so the page should not do it again.
   */
  fromKeyboard(action: MenuAction): boolean;
  /** Carries out `action` as the menu would; false when nothing on this screen answers it. */
  deliver(action: unknown): boolean;
}

export function createMenuRouter(clock: () => number = () => performance.now()): MenuRouter {
  const handlers = new Map<MenuAction, Handler[]>();
  const last = new Map<MenuAction, { source: 'menu' | 'keyboard'; at: number }>();
  /** Records a use of `action` from `source`; false when it echoes the other source's use. */
  const claim = (action: MenuAction, source: 'menu' | 'keyboard'): boolean => {
    const now = clock();
    const before = last.get(action);
    if (before && before.source !== source && now - before.at < KEYBOARD_ECHO_MS) {
      last.delete(action);
      return false;
    }
    last.set(action, { source, at: now });
    return true;
  };
  const router: MenuRouter = {
    register(action, handler) {
      const stack = handlers.get(action) ?? [];
      stack.push(handler);
      handlers.set(action, stack);
      return () => {
        const at = stack.lastIndexOf(handler);
        if (at >= 0) stack.splice(at, 1);
      };
    },
    connect(preload) {
      if (!preload || typeof preload.onMenu !== 'function') return () => {};
      const unsubscribe = preload.onMenu((action) => {
        router.deliver(action);
      });
      return typeof unsubscribe === 'function' ? unsubscribe : () => {};
    },
    fromKeyboard(action) {
      return claim(action, 'keyboard');
    },
    deliver(action) {
      if (!isMenuAction(action)) return false;
      const stack = handlers.get(action);
      const handler = stack?.[stack.length - 1];
      if (!handler) return false;
      if (claim(action, 'menu')) handler();
      return true;
    },
  };
  return router;
}

/** The app's one router: App connects it to the preload, pages register their handlers. */
export const menu = createMenuRouter();

/** Subscribes the app to the desktop menu for as long as the component is mounted. */
export function useMenuConnection(): void {
  useEffect(() => menu.connect(typeof window === 'undefined' ? undefined : window.holdfast), []);
}

/**
 * Answers the menu commands in `handlers` while the component is mounted; the handlers may
 * change on every render (the latest is called).
 */
export function useMenuCommands(handlers: Partial<Record<MenuAction, Handler>>): void {
  const latest = useRef(handlers);
  latest.current = handlers;
  const actions = (Object.keys(handlers) as MenuAction[]).filter(isMenuAction).sort().join(' ');
  useEffect(() => {
    const off = (actions ? (actions.split(' ') as MenuAction[]) : []).map((action) =>
      menu.register(action, () => latest.current[action]?.()),
    );
    return () => off.forEach((f) => f());
  }, [actions]);
}

/**
 * "New scenario" chosen away from the household page: the app opens that page, and its
 * scenario list opens the form for a new one when it appears.
 */
let newScenarioFor: string | null = null;

export function askForNewScenario(householdId: string): void {
  newScenarioFor = householdId;
}

/** True once, for the household a new scenario was asked for. */
export function takeNewScenarioRequest(householdId: string): boolean {
  if (newScenarioFor !== householdId) return false;
  newScenarioFor = null;
  return true;
}

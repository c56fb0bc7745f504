import { describe, expect, it } from 'vitest';
import { menuActions } from '../../../src-main/shell/app-menu.js';
import { preloadSource } from '../../../src-main/shell/preload-source.js';
import type { HoldfastPreload } from '../../../src-renderer/bridge.js';
import {
  askForNewScenario,
  createMenuRouter,
  isMenuAction,
  KEYBOARD_ECHO_MS,
  MENU_ACTIONS,
  takeNewScenarioRequest,
  type MenuAction,
} from '../../../src-renderer/app/menu.js';

/** A stand-in for the desktop preload: records the listener the page subscribes and sends to it. */
function fakePreload() {
  const listeners: ((action: string) => void)[] = [];
  const preload: HoldfastPreload = {
    call: () => Promise.reject(new Error('no service in this test')),
    onMenu(listener) {
      listeners.push(listener);
      return () => listeners.splice(listeners.indexOf(listener), 1);
    },
  };
  return { preload, listeners, send: (action: string) => listeners.forEach((l) => l(action)) };
}

describe('menu commands in the renderer', () => {
  it('lists the same actions as the desktop menu, in the same order', () => {
    // The renderer cannot import src-main/shell (typed against Electron and Node), so it mirrors the list.
    expect([...MENU_ACTIONS]).toEqual([...menuActions]);
  });

  it('subscribes through the onMenu the generated preload exposes', () => {
    const source = preloadSource([]);
    expect(source).toContain('onMenu(listener)');
  });

  it("a fake window.holdfast.onMenu delivering 'undo' and 'save-revision' reaches the page's handlers", () => {
    let clock = 0;
    const router = createMenuRouter(() => clock);
    const fake = fakePreload();
    const called: string[] = [];
    const disconnect = router.connect(fake.preload);
    expect(fake.listeners).toHaveLength(1);
    const offUndo = router.register('undo', () => called.push('undo'));
    router.register('save-revision', () => called.push('save-revision'));
    fake.send('undo');
    clock += 1000;
    fake.send('save-revision');
    expect(called).toEqual(['undo', 'save-revision']);
    // A handler that left (the page closed) no longer answers; unknown names never reach one.
    offUndo();
    clock += 1000;
    fake.send('undo');
    fake.send('format-disk');
    fake.send('');
    expect(called).toEqual(['undo', 'save-revision']);
    disconnect();
    expect(fake.listeners).toHaveLength(0);
    fake.send('save-revision');
    expect(called).toEqual(['undo', 'save-revision']);
  });

  it("the newest handler answers (the page's over the app's) and the older one answers again when it leaves", () => {
    const router = createMenuRouter(() => 0);
    const called: string[] = [];
    router.register('import-prices', () => called.push('app'));
    const off = router.register('import-prices', () => called.push('page'));
    expect(router.deliver('import-prices')).toBe(true);
    off();
    expect(router.deliver('import-prices')).toBe(true);
    expect(called).toEqual(['page', 'app']);
    expect(router.deliver('print-memo')).toBe(false);
  });

  it('without a preload (the local web host) nothing subscribes and nothing fails', () => {
    const router = createMenuRouter(() => 0);
    const disconnect = router.connect(undefined);
    expect(() => disconnect()).not.toThrow();
    const old: HoldfastPreload = { call: () => Promise.reject(new Error('unused')) };
    expect(() => router.connect(old)()).not.toThrow();
  });

  it('one key press seen both as the page shortcut and as the menu command acts once, in either order', () => {
    let clock = 0;
    const router = createMenuRouter(() => clock);
    let undone = 0;
    router.register('undo', () => undone++);
    // Keyboard first, then the menu's echo of the same keys.
    if (router.fromKeyboard('undo')) undone++;
    clock += 5;
    router.deliver('undo');
    expect(undone).toBe(1);
    // Menu first, then the page's own key handler.
    clock += 10_000;
    router.deliver('undo');
    clock += 5;
    if (router.fromKeyboard('undo')) undone++;
    expect(undone).toBe(2);
    // Two presses further apart than the echo window both act.
    clock += 10_000;
    if (router.fromKeyboard('undo')) undone++;
    clock += KEYBOARD_ECHO_MS + 1;
    router.deliver('undo');
    clock += KEYBOARD_ECHO_MS + 1;
    if (router.fromKeyboard('undo')) undone++;
    expect(undone).toBe(5);
    // A key press for another action does not swallow this one.
    clock += 10_000;
    router.fromKeyboard('redo');
    router.deliver('undo');
    expect(undone).toBe(6);
  });

  it('recognises exactly the listed actions', () => {
    for (const a of MENU_ACTIONS) expect(isMenuAction(a)).toBe(true);
    for (const a of ['Undo', 'print', 'new_scenario', 42, null, undefined]) expect(isMenuAction(a)).toBe(false);
    const all: MenuAction[] = [...MENU_ACTIONS];
    expect(new Set(all).size).toBe(all.length);
  });

  it('a new scenario asked for from another page is taken once, by its own household', () => {
    askForNewScenario('7');
    expect(takeNewScenarioRequest('8')).toBe(false);
    expect(takeNewScenarioRequest('7')).toBe(true);
    expect(takeNewScenarioRequest('7')).toBe(false);
  });
});

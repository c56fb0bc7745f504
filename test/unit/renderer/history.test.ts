import { describe, expect, it } from 'vitest';
import {
  HISTORY_LIMIT,
  applyEdit,
  canRedo,
  canUndo,
  createHistory,
  redo,
  undo,
} from '../../../src-renderer/scenario/history.js';

// The usual editor contract (common practice): undo walks back, redo walks forward, a new edit
// after an undo drops the redo branch.
describe('editor undo and redo', () => {
  it('undoes and redoes edits in order', () => {
    let h = createHistory('a');
    h = applyEdit(h, 'b');
    h = applyEdit(h, 'c');
    expect(canRedo(h)).toBe(false);
    h = undo(h);
    expect(h.present).toBe('b');
    h = undo(h);
    expect(h.present).toBe('a');
    expect(canUndo(h)).toBe(false);
    expect(undo(h)).toBe(h);
    h = redo(redo(h));
    expect(h.present).toBe('c');
    expect(redo(h)).toBe(h);
  });

  it('drops the redo branch when a new edit follows an undo', () => {
    let h = applyEdit(applyEdit(createHistory(1), 2), 3);
    h = applyEdit(undo(h), 4);
    expect(h.present).toBe(4);
    expect(canRedo(h)).toBe(false);
    expect(undo(h).present).toBe(2);
  });

  it('folds keystrokes in one field into one step, but not across fields or pauses', () => {
    let h = createHistory('');
    h = applyEdit(h, '1', { key: 'cap', at: 0 });
    h = applyEdit(h, '15', { key: 'cap', at: 300 });
    expect(undo(h).present).toBe('');
    h = applyEdit(h, '15x', { key: 'turnover', at: 400 });
    expect(undo(h).present).toBe('15');
    h = applyEdit(h, '15xy', { key: 'turnover', at: 5000 });
    expect(undo(h).present).toBe('15x');
  });

  it('ignores an edit that changes nothing', () => {
    const h = createHistory('same');
    expect(applyEdit(h, 'same')).toBe(h);
  });

  it(`keeps at most ${HISTORY_LIMIT} steps`, () => {
    let h = createHistory(0);
    for (let i = 1; i <= HISTORY_LIMIT + 50; i++) h = applyEdit(h, i);
    expect(h.past.length).toBe(HISTORY_LIMIT);
    expect(h.past[0]).toBe(50);
  });
});

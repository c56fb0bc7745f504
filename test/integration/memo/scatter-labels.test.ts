import { describe, expect, it } from 'vitest';
import { labelSides } from '../../../src-main/memo/charts.js';

describe('scatter labels are placed where they collide with no other label', () => {
  it('two points at almost the same height: the first label leaves the other marker free, the second avoids the first label', () => {
    const sides = labelSides(
      [
        { x: 200, y: 50, label: 'Ledoit-Wolf, maximum diversification', first: true },
        { x: 230, y: 45, label: 'EWMA 0.97, maximum diversification' },
      ],
      { width: 420, height: 120 },
    );
    // To the right, the first label would run over the second point's marker.
    expect(sides[0]).toBe('left');
    expect(sides[1]).toBe('right');
  });

  it('a label that would leave the plot on the right goes to the left', () => {
    expect(labelSides([{ x: 400, y: 60, label: 'Equal weights' }], { width: 420, height: 120 })).toEqual(['left']);
  });

  it('points far apart keep their labels on the right', () => {
    const sides = labelSides(
      [
        { x: 20, y: 20, label: 'A' },
        { x: 20, y: 100, label: 'B' },
      ],
      { width: 420, height: 120 },
    );
    expect(sides).toEqual(['right', 'right']);
  });
});

import { renderMemo } from '../src-main/memo/render-memo.js';
import { memoFixture } from '../test/integration/memo/memo-fixture.js';
import { timeMedian, type BenchSuite } from './harness.js';

/**
 * The allocation memo (issue 8): a 7-page memo with 5 charts (weights, risk contributions,
 * correlation heat map, stability bands, candidates) in at most 1.5 s. The input is the invented
 * layout fixture with stability bands and a stress table, without the walk-forward chart.
 */
export const memoBench: BenchSuite = {
  name: 'memo',
  async run() {
    const input = memoFixture({ extras: true });
    delete input.walkForward;
    input.stress = memoFixture({ extras: true }).stress;
    let bytes = 0;
    let pages = 0;
    const ms = await timeMedian(async () => {
      const pdf = await renderMemo(input);
      bytes = pdf.length;
      pages = (pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length;
    }, 7);
    return [
      {
        label: `renderMemo, ${pages} pages, 5 charts, ${input.run.estimate.assets.length} assets, ${input.run.candidates.length} candidates`,
        medianMs: ms,
        targetMs: 1500,
        notes: `${(bytes / 1024).toFixed(0)} KiB`,
      },
    ];
  },
};

import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateBook, type BookSettings } from '../shared-core/demo/book.js';
import { createBookStore } from '../src-main/demo/create-book-store.js';
import { median, type BenchFigure, type BenchSuite } from './harness.js';

/**
 * The book review's targets (issue 18): `holdfast review` over 50 households of 25-60 assets in
 * under 5 s whole-process, and under 60 s with `--resolve`. The peer is the numpy + cvxopt
 * reference script (test/reference/review/review_reference.py) computing the same drift, targets
 * and risk from the same book, as a whole process, alternating with ours.
 */
const here = dirname(fileURLToPath(import.meta.url));
const cli = join(here, '../src-main/cli/main.js');
const peerScript = join(here, '../../test/reference/review/review_reference.py');
/** The book both review figures use (and the book screen's, bench/book-screen.ts). */
export const REVIEW_BOOK: Partial<BookSettings> = {
  seed: 11,
  households: 50,
  assets: 80,
  perHousehold: [25, 60],
  months: 120,
};

function timed(command: string, args: readonly string[]): { ms: number; maxRssMb: number } {
  const t0 = performance.now();
  const r = spawnSync('/usr/bin/time', ['-f', 'maxrss_kb=%M', command, ...args], { encoding: 'utf8' });
  const ms = performance.now() - t0;
  if (r.status !== 0 && r.status !== 4) throw new Error(`${command} ${args.join(' ')} failed: ${r.stderr.slice(-400)}`);
  return { ms, maxRssMb: Number(/maxrss_kb=(\d+)/.exec(r.stderr)?.[1]) / 1024 };
}

export const reviewSuite: BenchSuite = {
  name: 'review',
  async run(): Promise<BenchFigure[]> {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-bench-review-'));
    try {
      const store = join(dir, 'book.hfstore');
      createBookStore(store, REVIEW_BOOK).store.close();
      const input = join(dir, 'book.json');
      writeFileSync(input, JSON.stringify(generateBook(REVIEW_BOOK)));
      const peerAvailable = spawnSync('/usr/bin/python3', ['-c', 'import numpy, cvxopt']).status === 0;
      const figures: BenchFigure[] = [];
      for (const [label, extra, runs, targetMs] of [
        ['review, 50 households of 25-60 assets, 120 months', [], 5, 5000],
        ['review --resolve, the same book', ['--resolve'], 3, 60000],
      ] as const) {
        const ours: number[] = [];
        const rss: number[] = [];
        const peer: number[] = [];
        for (let i = 0; i < runs; i++) {
          const o = timed(process.execPath, [cli, 'review', '--store', store, '--json', ...extra]);
          ours.push(o.ms);
          rss.push(o.maxRssMb);
          if (peerAvailable)
            peer.push(timed('/usr/bin/python3', [peerScript, input, join(dir, 'out.json'), '--on-target-too']).ms);
        }
        figures.push({
          label,
          medianMs: median(ours),
          targetMs,
          ...(peer.length ? { peerMs: median(peer), peerLabel: 'numpy + cvxopt script' } : {}),
          notes: `peak ${median(rss).toFixed(0)} MB${peerAvailable ? '' : '; peer not run (python3-numpy, python3-cvxopt missing)'}`,
        });
      }
      return figures;
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  },
};

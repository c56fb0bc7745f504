import { spawnSync } from 'node:child_process';
import { createWriteStream, mkdtempSync, rmSync } from 'node:fs';
import { once } from 'node:events';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { dayFromIso, weekday } from '../src-main/store/days.js';
import { openStore } from '../src-main/store/store.js';
import { median, timeMedian, type BenchFigure, type BenchSuite } from './harness.js';

/**
 * The store's targets (issue 5): a whole-process `holdfast import` of a wide CSV of 1500 assets
 * x 1261 days (about 20 MB) in at most 5 s with peak memory under 300 MB, and reading 500
 * assets x 3000 days from the store as a PriceTable in at most 200 ms.
 */
const cli = join(dirname(fileURLToPath(import.meta.url)), '../src-main/cli/main.js');

/** Park-Miller minimal standard generator (Park and Miller 1988, CACM): seeded and portable. */
function lcg(seed: number): () => number {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

function weekdays(from: string, count: number): number[] {
  const out: number[] = [];
  for (let d = dayFromIso(from); out.length < count; d++) if (weekday(d) < 5) out.push(d);
  return out;
}

async function writeWideCsv(path: string, assets: number, days: number, seed: number): Promise<number> {
  const rnd = lcg(seed);
  const out = createWriteStream(path);
  let bytes = 0;
  const write = async (text: string) => {
    bytes += text.length;
    if (!out.write(text)) await once(out, 'drain');
  };
  await write('date,' + Array.from({ length: assets }, (_, i) => `SYN${String(i).padStart(4, '0')}`).join(',') + '\n');
  const level = new Float64Array(assets).fill(100);
  for (const d of weekdays('2020-01-01', days)) {
    const cells = [new Date(d * 86400000).toISOString().slice(0, 10)];
    for (let i = 0; i < assets; i++) {
      level[i] *= Math.exp(0.012 * (rnd() + rnd() + rnd() - 1.5));
      cells.push(level[i].toFixed(6));
    }
    await write(cells.join(',') + '\n');
  }
  out.end();
  await once(out, 'finish');
  return bytes;
}

/** One whole `holdfast import` process: wall time and its maximum resident set (GNU time). */
function timedImport(dir: string, csv: string, run: number): { ms: number; maxRssMb: number; cpuMs: number } {
  const store = join(dir, `bench-${run}.hfstore`);
  const t0 = performance.now();
  const r = spawnSync(
    '/usr/bin/time',
    [
      '-f',
      'maxrss_kb=%M cpu_s=%U+%S',
      process.execPath,
      cli,
      'import',
      '--store',
      store,
      '--prices',
      csv,
      '--universe',
      'Bench',
    ],
    { encoding: 'utf8' },
  );
  const ms = performance.now() - t0;
  if (r.status !== 0) throw new Error(`holdfast import failed: ${r.stderr}`);
  const kb = Number(/maxrss_kb=(\d+)/.exec(r.stderr)?.[1]);
  const cpu = /cpu_s=([\d.]+)\+([\d.]+)/.exec(r.stderr);
  rmSync(store, { force: true });
  return { ms, maxRssMb: kb / 1024, cpuMs: cpu ? 1000 * (Number(cpu[1]) + Number(cpu[2])) : NaN };
}

export const storeSuite: BenchSuite = {
  name: 'store',
  async run(): Promise<BenchFigure[]> {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-bench-store-'));
    try {
      const figures: BenchFigure[] = [];
      const csv = join(dir, 'wide.csv');
      const bytes = await writeWideCsv(csv, 1500, 1261, 20260101);
      const runs = [0, 1, 2].map((i) => timedImport(dir, csv, i));
      figures.push({
        label: `holdfast import, wide CSV 1500 assets x 1261 days (${(bytes / 1e6).toFixed(1)} MB), whole process`,
        medianMs: median(runs.map((r) => r.ms)),
        targetMs: 5000,
        notes:
          `peak RSS ${Math.max(...runs.map((r) => r.maxRssMb)).toFixed(0)} MB (target < 300 MB); ` +
          `CPU (user+sys) median ${median(runs.map((r) => r.cpuMs)).toFixed(0)} ms, so a wall time far above it means a busy machine`,
      });

      const store = openStore(join(dir, 'read.hfstore'));
      const rnd = lcg(7);
      const days = Int32Array.from(weekdays('2014-01-01', 3000));
      const ids = Array.from({ length: 500 }, (_, i) => `R${i}`);
      store.commitPrices({
        source: 'bench',
        assets: ids.map((id) => ({ id, currency: 'EUR' })),
        prices: ids.map((assetId) => {
          const closes = new Float64Array(days.length);
          let p = 100;
          for (let t = 0; t < days.length; t++) closes[t] = p *= Math.exp(0.01 * (rnd() - 0.5));
          return { assetId, days, closes };
        }),
        universe: { name: 'Read' },
      });
      const ms = await timeMedian(() => store.priceTable({ universe: 'Read' }), 9);
      const windowMs = await timeMedian(
        () => store.priceTable({ universe: 'Read', from: '2019-01-01', to: '2023-12-31' }),
        9,
      );
      store.close();
      figures.push({ label: 'priceTable, universe of 500 assets x 3000 days', medianMs: ms, targetMs: 200 });
      figures.push({ label: 'priceTable, same universe, 5-year window', medianMs: windowMs, targetMs: 200 });
      return figures;
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  },
};

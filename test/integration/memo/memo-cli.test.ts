import { mkdirSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isSolved } from '../../../shared-core/optimise/result.js';
import { optimal } from '../../support/candidate-status.js';
import { DEMO_SCENARIO_NAME } from '../../../shared-core/demo/index.js';
import { priceTableFromText } from '../../../src-main/io/read-price-table.js';
import { runScenario } from '../../../shared-core/run/run-scenario.js';
import { parseScenarioText } from '../../../shared-core/scenario/schema.js';
import { estimateAndSolve } from '../../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest } from '../../../shared-core/walkforward/run-backtest.js';
import type { CliIO } from '../../../src-main/cli/command.js';
import { runCli } from '../../../src-main/cli/run-cli.js';
import { createDemoStore } from '../../../src-main/demo/create-demo-store.js';
import { writeDemoFiles } from '../../../src-main/demo/write-demo-files.js';
import { formatPct, formatPercent1, formatRatio2 } from '../../../shared-core/present/format.js';
import { CAUTIONS, SECTION_TITLES } from '../../../src-main/memo/render-memo.js';
import { sha256Hex } from '../../../src-main/store/canonical-json.js';
import { openStore } from '../../../src-main/store/store.js';
import { flatText, pageTexts, pdfInfo, renderPngs } from './poppler.js';

const artifacts = fileURLToPath(new URL('../../artifacts/memo/', import.meta.url));
mkdirSync(artifacts, { recursive: true });

/**
 * The figures of each asset's row in the candidates table. A long name wraps in its cell and its
 * figures sit on the line with the name's first part, so a row belongs to the one asset whose
 * name is, or uniquely starts with, the first cell; the table's column groups are concatenated.
 */
function candidateCells(lines: readonly string[], names: readonly string[]): Map<string, string[]> {
  const cellsByName = new Map<string, string[]>();
  for (const line of lines) {
    const parts = line.trim().split(/\s{2,}/);
    if (parts.length < 2 || !parts.slice(1).every((c) => /^(\d+\.\d|\u2013)$/.test(c))) continue;
    const owners = names.filter((n) => n === parts[0] || (parts[0].length >= 15 && n.startsWith(parts[0])));
    const owner = owners.includes(parts[0]) ? parts[0] : owners.length === 1 ? owners[0] : undefined;
    if (owner) cellsByName.set(owner, [...(cellsByName.get(owner) ?? []), ...parts.slice(1)]);
  }
  return cellsByName;
}

function fakeIo(cwd: string): CliIO & { out: string; err: string } {
  const io = {
    out: '',
    err: '',
    cwd,
    env: {},
    signal: new AbortController().signal,
    stdout: (t: string) => void (io.out += t),
    stderr: (t: string) => void (io.err += t),
  };
  return io;
}

describe('holdfast memo on the invented demo household (holdfast demo files)', () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-memo-cli-'));
    writeDemoFiles(join(dir, 'demo'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  const args = (out: string) => [
    'memo',
    '--prices',
    'demo/demo-prices.csv',
    '--scenario',
    'demo/demo-scenario.json',
    '--holdings',
    'demo/demo-household.json',
    '--fx',
    'demo/demo-fx.csv',
    '--prepared-by',
    'EM',
    '--date',
    '2026-01-15',
    '--out',
    out,
  ];

  it('prints every weight of every candidate as the scenario run (the solve) gives it, rounded by formatPercent1', async () => {
    const io = fakeIo(dir);
    expect(await runCli(args('memo.pdf'), io)).toBe(0);
    expect(io.out).toMatch(/^wrote memo\.pdf: \d+ bytes, memo hash [0-9a-f]{64}, pdf sha256 [0-9a-f]{64}\n$/);
    const pdf = readFileSync(join(dir, 'memo.pdf'));
    writeFileSync(join(artifacts, 'memo-demo.pdf'), pdf);
    renderPngs(pdf, artifacts, 'memo-demo');

    const parsed = parseScenarioText(readFileSync(join(dir, 'demo/demo-scenario.json'), 'utf8'));
    if (!parsed.ok) throw new Error('demo scenario does not parse');
    // The same run `holdfast solve` makes: prices converted to euro with the demo's FX series.
    const table = priceTableFromText(readFileSync(join(dir, 'demo/demo-prices.csv'), 'utf8')).table;
    const fx = priceTableFromText(readFileSync(join(dir, 'demo/demo-fx.csv'), 'utf8')).table;
    const currencies = table.assets.map((a) => parsed.scenario.assetInfo?.[a]?.currency);
    const run = runScenario(parsed.scenario, { ...table, currencies }, { fx });
    const pages = pageTexts(pdf);
    const text = pages.join('\n');
    const start = text.indexOf(SECTION_TITLES.candidates);
    const end = text.indexOf(SECTION_TITLES.method, start);
    const lines = text.slice(start, end).split('\n');
    const info = parsed.scenario.assetInfo!;
    const names = parsed.scenario.assets!.map((a) => info[a]?.name ?? a);
    const cellsByName = candidateCells(lines, names);
    const checked: string[] = [];
    for (const asset of parsed.scenario.assets!) {
      const name = info[asset]?.name ?? asset;
      const cells = cellsByName.get(name);
      if (!cells) continue;
      expect(cells, name).toEqual(
        run.candidates.map((c) => (c.status === 'optimal' ? formatPercent1(c.weights[asset] ?? 0) : '\u2013')),
      );
      checked.push(asset);
    }
    // Every asset held by some candidate has its row.
    const held = parsed.scenario.assets!.filter((a) =>
      run.candidates.some((c) => isSolved(c) && Math.abs(c.weights[a] ?? 0) >= 0.0005),
    );
    expect(checked).toEqual(expect.arrayContaining(held));
    const flat = flatText(pdf);
    for (const caution of CAUTIONS) expect(flat).toContain(caution);
    expect(flat).toContain('Maraval-Lindqvist family (invented)');
  });

  it('runs to at most 9 pages, the body before the appendix to at most 5, headings in the order a client reads (pdfinfo, pdftotext)', () => {
    const pdf = readFileSync(join(dir, 'memo.pdf'));
    const pages = pageTexts(pdf);
    expect(Number(pdfInfo(pdf).Pages)).toBe(pages.length);
    expect(pages.length).toBeLessThanOrEqual(9);
    const appendix = pages.findIndex((p) => /A\s+Why each position is held or left out/.test(p));
    expect(appendix, 'pages before the appendix').toBeGreaterThan(0);
    expect(appendix).toBeLessThanOrEqual(5);
    const flat = flatText(pdf);
    const headings = [
      `1 ${SECTION_TITLES.recommendation}`,
      `2 ${SECTION_TITLES.trades}`,
      `3 ${SECTION_TITLES.risk}`,
      `A ${SECTION_TITLES.reasons}`,
      `B ${SECTION_TITLES.candidates}`,
      `C ${SECTION_TITLES.method}`,
      `D ${SECTION_TITLES.cautions}`,
    ];
    let last = -1;
    for (const h of headings) {
      const at = flat.indexOf(h);
      expect(at, h).toBeGreaterThan(last);
      last = at;
    }
    expect(pages[0]).toMatch(/Buys\s+[\d,]+ EUR in \d+ trades/);
    // Counts agree with their nouns.
    expect(flat).not.toMatch(/\b1 (assets|trades|candidates|returns|positions)\b/);
  });

  it("the reasons table prints each asset's correlation with the portfolio and its threshold as the solve gives them; a freely held asset meets its threshold (Choueifaty, Froidure and Reynier 2013)", () => {
    const pdf = readFileSync(join(dir, 'memo.pdf'));
    const parsed = parseScenarioText(readFileSync(join(dir, 'demo/demo-scenario.json'), 'utf8'));
    if (!parsed.ok) throw new Error('demo scenario does not parse');
    const table = priceTableFromText(readFileSync(join(dir, 'demo/demo-prices.csv'), 'utf8')).table;
    const fx = priceTableFromText(readFileSync(join(dir, 'demo/demo-fx.csv'), 'utf8')).table;
    const currencies = table.assets.map((a) => parsed.scenario.assetInfo?.[a]?.currency);
    const run = runScenario(parsed.scenario, { ...table, currencies }, { fx });
    const rc = optimal(run.candidates.find((c) => c.id === parsed.scenario.recommended)!);
    const text = pageTexts(pdf).join('\n');
    const lines = text
      .slice(text.indexOf(SECTION_TITLES.reasons), text.indexOf('What the binding limits cost'))
      .split('\n');
    const info = parsed.scenario.assetInfo!;
    const names = parsed.scenario.assets!.map((a) => info[a]?.name ?? a);
    let held = 0;
    for (const a of rc.explanations!.assets) {
      const name = info[a.asset]?.name ?? a.asset;
      // A long name wraps: the figures sit on the line with its first part.
      const line = lines.find((l) => {
        const first = l.trim().split(/\s{2,}/)[0];
        return (
          first === name ||
          (first.length >= 15 && name.startsWith(first) && names.filter((n) => n.startsWith(first)).length === 1)
        );
      });
      expect(line, name).toBeDefined();
      const cells = line!.trim().split(/\s{2,}/);
      expect(cells.slice(-2), name).toEqual([formatRatio2(a.measure!), formatRatio2(a.threshold!)]);
      if (a.reason === 'held' || a.reason === 'group-limit') {
        expect(cells.at(-2)).toBe(cells.at(-1));
        held++;
      }
    }
    expect(held).toBeGreaterThan(3);
  });

  it('--backtest adds the walk-forward table with the figures runBacktest gives, and the stress table', async () => {
    const doc = JSON.parse(readFileSync(join(dir, 'demo/demo-scenario.json'), 'utf8'));
    doc.backtest = { estimationWindow: 36, rebalance: 'quarterly', costBps: 10 };
    doc.stress = { shocks: [{ name: 'Equity fall', target: 'Equity', shock: -0.3 }] };
    writeFileSync(join(dir, 'bt-scenario.json'), JSON.stringify(doc));
    const argv = args('bt.pdf').map((a) => (a === 'demo/demo-scenario.json' ? 'bt-scenario.json' : a));
    const io = fakeIo(dir);
    expect(await runCli([...argv, '--backtest'], io), io.err).toBe(0);
    const pdf = readFileSync(join(dir, 'bt.pdf'));
    writeFileSync(join(artifacts, 'memo-backtest.pdf'), pdf);
    renderPngs(pdf, artifacts, 'memo-backtest');
    const text = pageTexts(pdf).join('\n');
    expect(flatText(pdf)).toContain(`4 ${SECTION_TITLES.walkForward}`);
    // With the walk-forward and the stresses the targets still hold: body <= 5 pages, whole <= 9.
    const pages = pageTexts(pdf);
    expect(pages.length).toBeLessThanOrEqual(9);
    const appendix = pages.findIndex((p) => /A\s+Why each position is held or left out/.test(p));
    expect(appendix).toBeGreaterThan(0);
    expect(appendix).toBeLessThanOrEqual(5);
    const parsed = parseScenarioText(JSON.stringify(doc));
    if (!parsed.ok) throw new Error('scenario does not parse');
    // As the memo reads them: each asset in its own currency, converted with the --fx rates.
    const local = priceTableFromText(readFileSync(join(dir, 'demo/demo-prices.csv'), 'utf8')).table;
    const table = { ...local, currencies: local.assets.map((a) => parsed.scenario.assetInfo?.[a]?.currency) };
    const fx = priceTableFromText(readFileSync(join(dir, 'demo/demo-fx.csv'), 'utf8')).table;
    const run = await runBacktest(parsed.scenario, table, { estimateAndSolve, fx });
    const lines = text.slice(text.indexOf(SECTION_TITLES.walkForward)).split('\n');
    for (const c of run.candidates) {
      const label = parsed.scenario.candidates.find((x) => x.id === c.id)!.label!;
      // Long labels wrap: the figures sit on the line holding the label's first part.
      const line = lines.find((l) => l.trim().startsWith(label.slice(0, 18)) && /%\s*$/.test(l))!;
      expect(line, label).toBeDefined();
      const figures = line
        .trim()
        .split(/\s{2,}/)
        .slice(-5);
      expect(figures).toEqual([
        formatPct(c.metrics.annualisedReturn),
        formatPct(c.metrics.volatility),
        formatRatio2(c.metrics.sharpeRatio),
        formatPct(-c.metrics.maxDrawdown.depth),
        formatPct(c.metrics.turnoverPerYear),
      ]);
    }
    expect(flatText(pdf)).toContain('Equity fall');
  });

  it('matches holdfast solve --json for the same price and scenario files, weight by weight (formatPercent1)', async () => {
    const solveIo = fakeIo(dir);
    const files = ['--prices', 'demo/demo-prices.csv', '--scenario', 'demo/demo-scenario.json'];
    expect(await runCli(['solve', ...files, '--json'], solveIo), solveIo.err).toBe(0);
    const solved = JSON.parse(solveIo.out) as {
      candidates: { id: string; status: string; weights: Record<string, number> }[];
    };
    const io = fakeIo(dir);
    const argv = ['memo', ...files, '--household-name', 'Test household', '--date', '2026-01-15', '--out', 'plain.pdf'];
    expect(await runCli(argv, io), io.err).toBe(0);
    const text = pageTexts(readFileSync(join(dir, 'plain.pdf'))).join('\n');
    const lines = text.slice(text.indexOf(SECTION_TITLES.candidates), text.indexOf(SECTION_TITLES.method)).split('\n');
    const doc = JSON.parse(readFileSync(join(dir, 'demo/demo-scenario.json'), 'utf8')) as {
      assets: string[];
      assetInfo: Record<string, { name: string }>;
    };
    const cellsByName = candidateCells(
      lines,
      doc.assets.map((a) => doc.assetInfo[a].name),
    );
    let rows = 0;
    for (const asset of doc.assets) {
      const cells = cellsByName.get(doc.assetInfo[asset].name);
      if (!cells) continue;
      expect(cells, asset).toEqual(
        solved.candidates.map((c) => (c.status === 'optimal' ? formatPercent1(c.weights[asset] ?? 0) : '\u2013')),
      );
      rows++;
    }
    expect(rows).toBeGreaterThan(5);
  });

  it('gives the same bytes for the same inputs and date', async () => {
    expect(await runCli(args('again.pdf'), fakeIo(dir))).toBe(0);
    expect(readFileSync(join(dir, 'again.pdf')).equals(readFileSync(join(dir, 'memo.pdf')))).toBe(true);
  });

  it('bad input exits 2 with file, line and column, and writes nothing', async () => {
    writeFileSync(join(dir, 'broken.json'), '{\n  "format": "holdfast-scenario@1",\n  "name": \n}\n');
    const io = fakeIo(dir);
    const argv = args('never.pdf').map((a) => (a === 'demo/demo-scenario.json' ? 'broken.json' : a));
    expect(await runCli(argv, io)).toBe(2);
    expect(io.err).toMatch(/^holdfast memo: broken\.json:4:1: /);
    expect(existsSync(join(dir, 'never.pdf'))).toBe(false);
    expect(readdirSync(dir).filter((f) => f.startsWith('never.pdf'))).toEqual([]);

    const io2 = fakeIo(dir);
    writeFileSync(join(dir, 'holdings.json'), '{"positions":[{"asset":"NOPE","amount":5}]}');
    const argv2 = args('never.pdf').map((a) => (a === 'demo/demo-household.json' ? 'holdings.json' : a));
    expect(await runCli(argv2, io2)).toBe(2);
    expect(io2.err).toContain(
      "holdings.json: positions[0].asset: asset 'NOPE' is held but not in the scenario's assets",
    );
    expect(existsSync(join(dir, 'never.pdf'))).toBe(false);
  });

  it('store form: saves the memo beside its revision, and a reprint is byte-identical and not saved twice', async () => {
    const storePath = join(dir, 'demo.hfstore');
    await createDemoStore(storePath);
    const argv = [
      'memo',
      '--store',
      'demo.hfstore',
      '--household',
      'Maraval-Lindqvist family (invented)',
      '--scenario',
      DEMO_SCENARIO_NAME,
      '--date',
      '2026-01-15',
      '--out',
      'stored.pdf',
    ];
    const io = fakeIo(dir);
    expect(await runCli(argv, io), io.err).toBe(0);
    expect(io.out).toContain('saved in the store as memo');
    const pdf = readFileSync(join(dir, 'stored.pdf'));
    const store = openStore(storePath, { create: false });
    try {
      const household = store.getHousehold('Maraval-Lindqvist family (invented)')!;
      const scenario = store.getScenario(household.id, DEMO_SCENARIO_NAME)!;
      const memos = store.listMemos(scenario.id);
      expect(memos).toHaveLength(1);
      expect(memos[0].sha256).toBe(sha256Hex(pdf));
      expect(memos[0].revisionHash).toBe(store.getRevision(scenario.id)!.hash);
      expect(Buffer.from(store.getMemoPdf(memos[0].id)!).equals(pdf)).toBe(true);
    } finally {
      store.close();
    }
    const io2 = fakeIo(dir);
    expect(
      await runCli(
        argv.map((a) => (a === 'stored.pdf' ? 'reprint.pdf' : a)),
        io2,
      ),
    ).toBe(0);
    expect(io2.out).toContain('identical to memo');
    expect(readFileSync(join(dir, 'reprint.pdf')).equals(pdf)).toBe(true);
  });
});

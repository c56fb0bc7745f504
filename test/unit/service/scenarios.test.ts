import { describe, expect, it } from 'vitest';
import { seedPrices, useService, weekdays, type Harness } from './service-fixture.js';

const service = useService();

const document = {
  format: 'holdfast-scenario@1',
  name: 'Invented review',
  baseCurrency: 'EUR',
  assets: ['AAA', 'BBB'],
  window: { years: 1 },
  constraints: { longOnly: true, weightBounds: { default: [0, 0.8] } },
  candidates: [{ id: 'lw-minvar', estimator: { method: 'ledoit-wolf' }, objective: { method: 'min-variance' } }],
};

async function household(h: Harness): Promise<string> {
  seedPrices(h.store, 'Invented core', {
    AAA: { dates: weekdays('2025-01-06', 10) },
    BBB: { dates: weekdays('2025-01-06', 10) },
  });
  return (await h.call('households.create', { name: 'Invented family', baseCurrency: 'EUR' })).id;
}

describe('service: scenarios, revisions and drafts', () => {
  it('creates a scenario as revision 1 and lists it under its household', async () => {
    const h = service();
    const householdId = await household(h);
    const created = await h.call('scenarios.create', {
      householdId,
      document,
      universe: 'Invented core',
      author: 'ab',
      note: 'first look',
    });
    expect(created.scenario).toMatchObject({
      name: 'Invented review',
      universe: 'Invented core',
      revisionCount: 1,
      hasDraft: false,
      latestRevision: { number: 1, author: 'AB', note: 'first look' },
    });
    expect(created.scenario.latestRevision!.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(created.document).toMatchObject({ name: 'Invented review', assets: ['AAA', 'BBB'] });
    const list = await h.call('scenarios.list', { householdId });
    expect(list.map((s) => s.id)).toEqual([created.scenario.id]);
    expect((await h.call('households.get', { householdId })).scenarioCount).toBe(1);
  });

  it('refuses an invalid first revision with its JSON path and creates nothing', async () => {
    const h = service();
    const householdId = await household(h);
    const bad = {
      ...document,
      candidates: [{ id: 'x', estimator: { method: 'sample' }, objective: { method: 'max-div' } }],
    };
    const reply = await h.reply('scenarios.create', { householdId, document: bad, author: 'AB' });
    expect(reply.ok).toBe(false);
    if (!reply.ok) {
      expect(reply.error.code).toBe('bad-request');
      expect(reply.error.message).toContain('candidates[0].objective.method');
      expect(reply.error.message).toContain('max-diversification');
    }
    expect(await h.call('scenarios.list', { householdId })).toEqual([]);
    const badInitials = await h.reply('scenarios.create', { householdId, document, author: 'A1' });
    expect(badInitials).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'author' } });
    await h.call('scenarios.create', { householdId, document, author: 'AB' });
    const twice = await h.reply('scenarios.create', { householdId, document, author: 'AB' });
    expect(twice).toMatchObject({ ok: false, error: { code: 'conflict', where: 'document.name' } });
  });

  it('autosaves a draft that may be invalid, and a saved revision clears it', async () => {
    const h = service();
    const householdId = await household(h);
    const { scenario } = await h.call('scenarios.create', { householdId, document, author: 'AB' });
    const halfTyped = { ...document, constraints: { weightBounds: { default: [0, 'abc'] } } };
    await h.call('scenarios.saveDraft', { scenarioId: scenario.id, document: halfTyped });
    const withDraft = await h.call('scenarios.get', { scenarioId: scenario.id });
    expect(withDraft.scenario.hasDraft).toBe(true);
    expect(withDraft.draft!.document).toEqual(halfTyped);
    expect(withDraft.document).toMatchObject({ constraints: { weightBounds: { default: [0, 0.8] } } });

    const invalid = await h.reply('scenarios.saveRevision', {
      scenarioId: scenario.id,
      document: halfTyped,
      author: 'AB',
    });
    expect(invalid.ok).toBe(false);
    if (!invalid.ok) expect(invalid.error.message).toContain('constraints.weightBounds.default[1]');

    const next = { ...document, constraints: { longOnly: true, weightBounds: { default: [0, 0.6] } } };
    const rev2 = await h.call('scenarios.saveRevision', {
      scenarioId: scenario.id,
      document: next,
      author: 'cd',
      note: 'tighter cap',
    });
    expect(rev2).toMatchObject({ number: 2, author: 'CD', note: 'tighter cap' });
    const after = await h.call('scenarios.get', { scenarioId: scenario.id });
    expect(after.draft).toBeNull();
    expect(after.scenario.latestRevision!.number).toBe(2);
  });

  it('lists revisions newest first, opens an earlier one, compares and restores without rewriting history', async () => {
    const h = service();
    const householdId = await household(h);
    const { scenario } = await h.call('scenarios.create', { householdId, document, author: 'AB' });
    const next = { ...document, constraints: { longOnly: true, weightBounds: { default: [0, 0.6] } } };
    await h.call('scenarios.saveRevision', { scenarioId: scenario.id, document: next, author: 'AB' });
    const revisions = await h.call('scenarios.revisions', { scenarioId: scenario.id });
    expect(revisions.map((r) => r.number)).toEqual([2, 1]);
    const first = await h.call('scenarios.revision', { scenarioId: scenario.id, revision: 1 });
    expect(first.document).toMatchObject({ constraints: { weightBounds: { default: [0, 0.8] } } });
    const diff = await h.call('scenarios.compare', { scenarioId: scenario.id, from: 1, to: 2 });
    expect(diff.changes).toContainEqual({ path: 'constraints.weightBounds.default[1]', before: 0.8, after: 0.6 });
    const restored = await h.call('scenarios.restore', { scenarioId: scenario.id, revision: 1, author: 'AB' });
    expect(restored.number).toBe(3);
    // Same document, same canonical hash: the results cache and the memo footer agree.
    expect(restored.hash).toBe(revisions[1].hash);
    expect((await h.call('scenarios.revisions', { scenarioId: scenario.id })).map((r) => r.number)).toEqual([3, 2, 1]);
    expect(await h.reply('scenarios.revision', { scenarioId: scenario.id, revision: 9 })).toMatchObject({
      ok: false,
      error: { code: 'not-found', where: 'revision' },
    });
  });

  it('caches results under revision hash and data version, and misses on another data version', async () => {
    const h = service();
    const householdId = await household(h);
    const { scenario } = await h.call('scenarios.create', { householdId, document, author: 'AB' });
    const hash = scenario.latestRevision!.hash;
    const dataVersion = (await h.call('app.info', {})).dataVersion;
    const results = { candidates: [{ id: 'lw-minvar', weights: { AAA: 0.5, BBB: 0.5 } }] };
    await h.call('results.put', { revisionHash: hash, dataVersion, results });
    expect(await h.call('results.get', { revisionHash: hash, dataVersion })).toEqual({ results });
    expect(await h.call('results.get', { revisionHash: hash, dataVersion: dataVersion + 1 })).toEqual({
      results: null,
    });
    expect(await h.call('results.get', { revisionHash: hash, dataVersion, kind: 'walk-forward' })).toEqual({
      results: null,
    });
  });
});

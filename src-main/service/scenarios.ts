import { ServiceFailure, type ImplementationOf } from '../../shared-core/contract/define.js';
import type { ScenarioDetail, ScenarioSummary, ServiceApiTable } from '../../shared-core/contract/service-api.js';
import { parseScenario, type ScenarioInput } from '../../shared-core/scenario/schema.js';
import type { ScenarioRecord, Store } from '../store/store.js';
import { notFound, rowId } from './failures.js';
import { revisionOut } from './records.js';

type Part = Pick<
  ImplementationOf<ServiceApiTable>,
  | 'scenarios.list'
  | 'scenarios.get'
  | 'scenarios.create'
  | 'scenarios.saveDraft'
  | 'scenarios.saveRevision'
  | 'scenarios.revisions'
  | 'scenarios.revision'
  | 'scenarios.compare'
  | 'scenarios.restore'
  | 'results.get'
  | 'results.put'
>;

function parsedOrNull(text: string): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return null;
  }
}

/** Scenarios, their revisions and drafts, and the results cache keyed by revision hash. */
export function scenarioMethods(store: Store): Part {
  function scenario(wireId: string): ScenarioRecord {
    const record = store.getScenarioById(rowId('scenario', wireId));
    if (!record) throw notFound('scenario', wireId);
    return record;
  }

  function revisionsNewestFirst(id: number) {
    return store.listRevisions(id).sort((a, b) => b.number - a.number);
  }

  function summary(record: ScenarioRecord): ScenarioSummary {
    const revisions = revisionsNewestFirst(record.id);
    const draft = store.getDraft(record.id);
    const times = [record.createdAt, revisions[0]?.savedAt, draft?.savedAt].filter((t): t is string => !!t).sort();
    return {
      id: String(record.id),
      householdId: String(record.householdId),
      name: record.name,
      universe: record.universe ?? null,
      createdAt: record.createdAt,
      updatedAt: times[times.length - 1],
      latestRevision: revisions[0] ? revisionOut(revisions[0]) : null,
      revisionCount: revisions.length,
      hasDraft: draft !== undefined,
    };
  }

  function detail(record: ScenarioRecord): ScenarioDetail {
    const latest = store.getRevision(record.id);
    const draft = store.getDraft(record.id);
    return {
      scenario: summary(record),
      document: latest ? (latest.document as ScenarioInput) : null,
      draft: draft ? { document: parsedOrNull(draft.text), text: draft.text, savedAt: draft.savedAt } : null,
    };
  }

  return {
    async 'scenarios.list'({ householdId }) {
      const id = rowId('household', householdId);
      if (!store.getHousehold(id)) throw notFound('household', householdId);
      return store
        .listScenarios(id)
        .map(summary)
        .sort((a, b) => a.name.localeCompare(b.name));
    },
    async 'scenarios.get'({ scenarioId }) {
      return detail(scenario(scenarioId));
    },
    async 'scenarios.create'({ householdId, document, universe, author, note }) {
      const id = rowId('household', householdId);
      if (!store.getHousehold(id)) throw notFound('household', householdId);
      const parsed = parseScenario(document);
      // Nothing is created unless the first revision is valid; the message names the JSON path.
      if (!parsed.ok) throw parsed.errors[0].inFile('document');
      const name = parsed.scenario.name;
      if (store.getScenario(id, name))
        throw new ServiceFailure('conflict', `this household has a scenario named '${name}' already`, 'document.name');
      if (universe !== undefined && !store.getUniverse(universe))
        throw new ServiceFailure('not-found', `no universe named '${universe}'`, 'universe');
      const record = store.transaction(() => {
        const created = store.createScenario({ householdId: id, name, universe });
        store.saveRevision(created.id, document, { author, note });
        return created;
      });
      return detail(scenario(String(record.id)));
    },
    async 'scenarios.saveDraft'({ scenarioId, document }) {
      const record = scenario(scenarioId);
      const text = JSON.stringify(document ?? null, null, 2);
      return { savedAt: store.saveDraft(record.id, text).savedAt };
    },
    async 'scenarios.saveRevision'({ scenarioId, document, author, note }) {
      const record = scenario(scenarioId);
      return revisionOut(store.saveRevision(record.id, document, { author, note }));
    },
    async 'scenarios.revisions'({ scenarioId }) {
      return revisionsNewestFirst(scenario(scenarioId).id).map(revisionOut);
    },
    async 'scenarios.revision'({ scenarioId, revision }) {
      const record = scenario(scenarioId);
      const found = store.getRevision(record.id, revision);
      if (!found)
        throw new ServiceFailure('not-found', `scenario '${record.name}' has no revision ${revision}`, 'revision');
      return { revision: revisionOut(found), document: found.document as ScenarioInput };
    },
    async 'scenarios.compare'({ scenarioId, from, to }) {
      const record = scenario(scenarioId);
      const comparison = store.compareRevisions(record.id, from, to);
      return {
        from: revisionOut(comparison.from),
        to: revisionOut(comparison.to),
        changes: comparison.changes.map((c) => ({ path: c.path, before: c.before, after: c.after })),
      };
    },
    async 'scenarios.restore'({ scenarioId, revision, author, note }) {
      const record = scenario(scenarioId);
      return revisionOut(store.restoreRevision(record.id, revision, { author, note }));
    },
    async 'results.get'({ revisionHash, dataVersion, kind }) {
      const results = store.getCachedResult(revisionHash, dataVersion, kind);
      return { results: results === undefined ? null : results };
    },
    async 'results.put'({ revisionHash, dataVersion, kind, results }) {
      store.putCachedResult(revisionHash, dataVersion, kind, results);
      return { ok: true as const };
    },
  };
}

import type { Asset } from '../../shared-core/contract/service-api.js';
import type { EstimatorSpec } from '../../shared-core/scenario/estimator-spec.js';
import type { ObjectiveSpec } from '../../shared-core/scenario/objective-spec.js';
import type { AssetInfo, ScenarioInput } from '../../shared-core/scenario/schema.js';
import { candidatesForGrid, gridFromCandidates, isTicked, specKey, type CandidateGrid } from './candidate-grid.js';
import { setIn, type PathKey } from './document-edit.js';

/**
 * What the undo history holds: the scenario document as the advisor is writing it, and the grid
 * of risk estimates and objectives its candidates come from. Every edit is a pure function from
 * one state to the next.
 */
export interface EditorState {
  doc: ScenarioInput;
  grid: CandidateGrid;
}

export function editorStateFor(doc: ScenarioInput): EditorState {
  return { doc, grid: gridFromCandidates(Array.isArray(doc.candidates) ? doc.candidates : []) };
}

export function setField(state: EditorState, path: readonly PathKey[], value: unknown): EditorState {
  return { ...state, doc: setIn(state.doc, path, value) };
}

/** The asset's descriptive tags as the scenario carries them (the store's tags, copied in). */
export function assetInfoOf(asset: Asset): AssetInfo {
  const info: AssetInfo = { name: asset.name, liquidity: asset.liquidity };
  if (asset.assetClass) info.assetClass = asset.assetClass;
  if (asset.region) info.region = asset.region;
  if (asset.currency) info.currency = asset.currency;
  return info;
}

/** Adds or removes assets; a removed asset leaves its bounds, returns, tags and band memberships too. */
export function setAssets(state: EditorState, assets: readonly string[], catalogue: readonly Asset[]): EditorState {
  const keep = new Set(assets);
  const doc = state.doc;
  const prune = <T>(record: Record<string, T> | undefined, keepKey: (k: string) => boolean) =>
    record ? Object.fromEntries(Object.entries(record).filter(([k]) => keepKey(k))) : undefined;
  const byId = new Map(catalogue.map((a) => [a.id, a]));
  const assetInfo: Record<string, AssetInfo> = {};
  for (const id of assets) {
    const known = doc.assetInfo?.[id] ?? (byId.has(id) ? assetInfoOf(byId.get(id) as Asset) : undefined);
    if (known) assetInfo[id] = known;
  }
  const constraints = doc.constraints ?? {};
  const groups = constraints.groups?.map((g) => ({ ...g, members: g.members.filter((m) => keep.has(m)) }));
  const next: ScenarioInput = {
    ...doc,
    assets: [...assets],
    assetInfo,
    constraints: {
      ...constraints,
      weightBounds: prune(constraints.weightBounds, (k) => k === 'default' || keep.has(k)),
      ...(groups ? { groups } : {}),
    },
  };
  if (doc.expectedReturns) next.expectedReturns = prune(doc.expectedReturns, (k) => keep.has(k));
  if (next.constraints && next.constraints.weightBounds === undefined) delete next.constraints.weightBounds;
  return { ...state, doc: next };
}

function withCandidates(
  state: EditorState,
  grid: CandidateGrid,
  ticked: (e: EstimatorSpec, o: ObjectiveSpec) => boolean,
  renamed?: ReadonlyMap<string, string>,
): EditorState {
  const candidates = candidatesForGrid(grid, ticked, state.doc.candidates ?? [], renamed);
  const doc: ScenarioInput = { ...state.doc, candidates };
  if (doc.recommended !== undefined && !candidates.some((c) => c.id === doc.recommended)) delete doc.recommended;
  return { doc, grid };
}

const keepTicks = (state: EditorState) => (e: EstimatorSpec, o: ObjectiveSpec) =>
  isTicked(state.doc.candidates ?? [], e, o);

/** A new risk estimate row, ticked against every objective. */
export function addEstimator(state: EditorState, spec: EstimatorSpec): EditorState {
  if (state.grid.estimators.some((e) => specKey(e) === specKey(spec))) return state;
  const grid = { ...state.grid, estimators: [...state.grid.estimators, spec] };
  const old = keepTicks(state);
  return withCandidates(state, grid, (e, o) => (specKey(e) === specKey(spec) ? true : old(e, o)));
}

export function addObjective(state: EditorState, spec: ObjectiveSpec): EditorState {
  if (state.grid.objectives.some((o) => specKey(o) === specKey(spec))) return state;
  const grid = { ...state.grid, objectives: [...state.grid.objectives, spec] };
  const old = keepTicks(state);
  return withCandidates(state, grid, (e, o) => (specKey(o) === specKey(spec) ? true : old(e, o)));
}

export function removeEstimator(state: EditorState, index: number): EditorState {
  const grid = { ...state.grid, estimators: state.grid.estimators.filter((_, i) => i !== index) };
  return withCandidates(state, grid, keepTicks(state));
}

export function removeObjective(state: EditorState, index: number): EditorState {
  const grid = { ...state.grid, objectives: state.grid.objectives.filter((_, i) => i !== index) };
  return withCandidates(state, grid, keepTicks(state));
}

/** Changes a risk estimate's method or options; its candidates follow and keep their overrides. */
export function updateEstimator(state: EditorState, index: number, spec: EstimatorSpec): EditorState {
  const before = state.grid.estimators[index];
  if (!before || state.grid.estimators.some((e, i) => i !== index && specKey(e) === specKey(spec))) return state;
  const grid = { ...state.grid, estimators: state.grid.estimators.map((e, i) => (i === index ? spec : e)) };
  const old = keepTicks(state);
  return withCandidates(
    state,
    grid,
    (e, o) => old(specKey(e) === specKey(spec) ? before : e, o),
    new Map([[specKey(before), specKey(spec)]]),
  );
}

export function updateObjective(state: EditorState, index: number, spec: ObjectiveSpec): EditorState {
  const before = state.grid.objectives[index];
  if (!before || state.grid.objectives.some((o, i) => i !== index && specKey(o) === specKey(spec))) return state;
  const grid = { ...state.grid, objectives: state.grid.objectives.map((o, i) => (i === index ? spec : o)) };
  const old = keepTicks(state);
  return withCandidates(
    state,
    grid,
    (e, o) => old(e, specKey(o) === specKey(spec) ? before : o),
    new Map([[specKey(before), specKey(spec)]]),
  );
}

export function setCell(
  state: EditorState,
  estimator: EstimatorSpec,
  objective: ObjectiveSpec,
  on: boolean,
): EditorState {
  const old = keepTicks(state);
  return withCandidates(state, state.grid, (e, o) =>
    specKey(e) === specKey(estimator) && specKey(o) === specKey(objective) ? on : old(e, o),
  );
}

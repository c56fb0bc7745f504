import { InputError } from '../errors.js';
import type { AssetInfo } from '../scenario/schema.js';

/**
 * Named sets of assets a stress view can target: each asset on its own, each group band of the
 * scenario's constraints, and each asset class of `assetInfo`. Asset ids win over group names,
 * group names over asset classes.
 */
export interface AssetSet {
  name: string;
  kind: 'asset' | 'group' | 'asset-class';
  members: string[];
}

export function assetSets(
  assets: readonly string[],
  groups: readonly { name: string; members: readonly string[] }[] = [],
  assetInfo: Record<string, AssetInfo> = {},
): AssetSet[] {
  const inUniverse = new Set(assets);
  const sets: AssetSet[] = assets.map((a) => ({ name: a, kind: 'asset', members: [a] }));
  for (const g of groups) {
    const members = g.members.filter((m) => inUniverse.has(m));
    if (members.length) sets.push({ name: g.name, kind: 'group', members });
  }
  const classes = new Map<string, string[]>();
  for (const a of assets) {
    const c = assetInfo[a]?.assetClass;
    if (c !== undefined) classes.set(c, [...(classes.get(c) ?? []), a]);
  }
  for (const [name, members] of classes) sets.push({ name, kind: 'asset-class', members });
  return sets;
}

/** The set a shock's `target` names; an unknown target is an InputError at `path`. */
export function resolveTarget(target: string, sets: readonly AssetSet[], path: string): AssetSet {
  const found = sets.find((s) => s.name === target);
  if (found) return found;
  const names = sets.filter((s) => s.kind !== 'asset').map((s) => s.name);
  throw new InputError(
    `unknown target '${target}': expected an asset id${names.length ? ` or one of ${names.join(', ')}` : ' (the scenario names no groups or asset classes)'}`,
    { path },
  );
}

/** Equal weights over the set's members, in `assets` order (the exposure g of a group shock). */
export function exposureOf(set: AssetSet, assets: readonly string[]): Float64Array {
  const g = new Float64Array(assets.length);
  for (const m of set.members) g[assets.indexOf(m)] = 1 / set.members.length;
  return g;
}

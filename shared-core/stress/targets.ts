import { InputError } from '../errors.js';
import { assetClassWords, canonicalAssetClass } from '../scenario/asset-class.js';
import type { AssetInfo } from '../scenario/schema.js';

/**
 * Named sets of assets a stress view can target: each asset on its own, each group band of the
 * scenario's constraints, and each asset class of `assetInfo` (in its one spelling, so "Equity"
 * and "equity" are one class). Asset ids win over group names, group names over asset classes.
 */
export interface AssetSet {
  /** What a shock's `target` names it by. */
  name: string;
  kind: 'asset' | 'group' | 'asset-class';
  members: string[];
  /**
   * How a stress table names it: a group and an asset class may share a name ("Equity" the
   * group, "equity" the class) and still hold different assets, so each says which it is.
   */
  label: string;
}

export function assetSets(
  assets: readonly string[],
  groups: readonly { name: string; members: readonly string[] }[] = [],
  assetInfo: Record<string, AssetInfo> = {},
): AssetSet[] {
  const inUniverse = new Set(assets);
  const sets: AssetSet[] = assets.map((a) => ({ name: a, kind: 'asset', members: [a], label: a }));
  for (const g of groups) {
    const members = g.members.filter((m) => inUniverse.has(m));
    if (members.length) sets.push({ name: g.name, kind: 'group', members, label: `the ${g.name} group` });
  }
  const classes = new Map<string, string[]>();
  for (const a of assets) {
    const c = assetInfo[a]?.assetClass;
    if (c !== undefined && c.trim() !== '') {
      const name = canonicalAssetClass(c);
      classes.set(name, [...(classes.get(name) ?? []), a]);
    }
  }
  for (const [name, members] of classes)
    sets.push({ name, kind: 'asset-class', members, label: `the ${assetClassWords(name)} class` });
  return sets;
}

/**
 * The sets a historical stress replays, each once: a set holding the same assets as one before it
 * (an asset class that is also a group) would only repeat that row's figures.
 */
export function distinctBases(sets: readonly AssetSet[]): AssetSet[] {
  const seen = new Set<string>();
  return sets.filter((s) => {
    const key = [...s.members].sort().join('\n');
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

/** The set a shock's `target` names; an unknown target is an InputError at `path`. */
export function resolveTarget(target: string, sets: readonly AssetSet[], path: string): AssetSet {
  const found =
    sets.find((s) => s.name === target) ??
    sets.find((s) => s.kind === 'asset-class' && s.name === canonicalAssetClass(target));
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

import { ServiceFailure, type ImplementationOf } from '../../shared-core/contract/define.js';
import type { ServiceApiTable } from '../../shared-core/contract/service-api.js';
import type { AssetRecord, Store, UniverseRecord } from '../store/store.js';
import { notFound, rowId } from './failures.js';
import { assetOut, memberOut, universeOut } from './records.js';

type Part = Pick<
  ImplementationOf<ServiceApiTable>,
  'universes.list' | 'universes.get' | 'universes.setGroups' | 'assets.list' | 'assets.get' | 'assets.update'
>;

/** The library: universes (named sets of assets with group tags) and the assets' descriptive tags. */
export function libraryMethods(store: Store): Part {
  function universe(wireId: string): UniverseRecord {
    const id = rowId('universe', wireId);
    const record = store.listUniverses().find((u) => u.id === id);
    if (!record) throw notFound('universe', wireId);
    return record;
  }

  function asset(assetId: string): AssetRecord {
    const record = store.getAsset(assetId);
    if (!record) throw new ServiceFailure('not-found', `no asset '${assetId}' in the store`);
    return record;
  }

  return {
    async 'universes.list'() {
      return store
        .listUniverses()
        .sort((a, b) => a.name.localeCompare(b.name))
        .map(universeOut);
    },
    async 'universes.get'({ universeId }) {
      const record = universe(universeId);
      return { universe: universeOut(record), members: record.members.map((m) => memberOut(store, m)) };
    },
    async 'universes.setGroups'({ universeId, asset: assetId, groups }) {
      const record = universe(universeId);
      if (!record.members.some((m) => m.assetId === assetId))
        throw new ServiceFailure('not-found', `asset '${assetId}' is not in universe '${record.name}'`, 'asset');
      const tags = [...new Set(groups)];
      const members = record.members.map((m) => (m.assetId === assetId ? { assetId, tags } : m));
      const saved = store.saveUniverse(record.name, members, record.description);
      const member = saved.members.find((m) => m.assetId === assetId);
      if (!member) throw new Error(`universe '${record.name}' lost asset '${assetId}' on saving`);
      return memberOut(store, member);
    },
    async 'assets.list'() {
      return store
        .listAssets()
        .sort((a, b) => a.id.localeCompare(b.id))
        .map(assetOut);
    },
    async 'assets.get'({ assetId }) {
      return assetOut(asset(assetId));
    },
    async 'assets.update'({ assetId, fields }) {
      const current = asset(assetId);
      const liquidityChanged = fields.liquidity !== undefined || fields.lockUpDays !== undefined;
      const tag = fields.liquidity ?? current.liquidity.tag;
      const lockUpDays =
        fields.lockUpDays === undefined ? current.liquidity.lockUpDays : (fields.lockUpDays ?? undefined);
      store.upsertAssets([
        {
          id: assetId,
          ...(fields.name !== undefined ? { displayName: fields.name } : {}),
          ...(fields.assetClass !== undefined ? { assetClass: fields.assetClass } : {}),
          ...(fields.region !== undefined ? { region: fields.region } : {}),
          ...(fields.currency !== undefined ? { currency: fields.currency } : {}),
          ...(fields.notes !== undefined ? { notes: fields.notes } : {}),
          ...(liquidityChanged
            ? { liquidity: tag === 'illiquid' && lockUpDays !== undefined ? { tag, lockUpDays } : { tag } }
            : {}),
        },
      ]);
      return assetOut(asset(assetId));
    },
  };
}

import { ServiceFailure, type ImplementationOf } from '../../shared-core/contract/define.js';
import { priceTableToWire, type ServiceApiTable } from '../../shared-core/contract/service-api.js';
import type { Store } from '../store/store.js';
import { seriesCoverage } from './coverage.js';
import { notFound, rowId } from './failures.js';

type Part = Pick<ImplementationOf<ServiceApiTable>, 'prices.coverage' | 'prices.series' | 'prices.table'>;

/** Price histories: what the store holds for each asset, one series for a chart, aligned tables. */
export function priceMethods(store: Store): Part {
  function assetIdsOf(universeId: string | undefined, assets: string[] | undefined): string[] {
    if (universeId !== undefined && assets !== undefined)
      throw new ServiceFailure('bad-request', 'give a universe or a list of assets, not both', 'assets');
    if (assets !== undefined) return assets;
    if (universeId !== undefined) {
      const id = rowId('universe', universeId);
      const universe = store.listUniverses().find((u) => u.id === id);
      if (!universe) throw notFound('universe', universeId);
      return universe.members.map((m) => m.assetId);
    }
    return store.listAssets().map((a) => a.id);
  }

  function requireAssets(ids: readonly string[]): void {
    ids.forEach((id, i) => {
      if (!store.getAsset(id)) throw new ServiceFailure('not-found', `no asset '${id}' in the store`, `assets[${i}]`);
    });
  }

  return {
    async 'prices.coverage'({ universeId, assets, minGapWeekdays }) {
      const ids = assetIdsOf(universeId, assets);
      requireAssets(ids);
      const series = store.priceSeriesMany(ids);
      const rows = ids.map((id) => {
        const record = store.getAsset(id)!;
        const s = series.get(id);
        const dates = s ? s.dates.filter((_, i) => Number.isFinite(s.closes[i])) : [];
        const c = seriesCoverage(dates, minGapWeekdays);
        return {
          asset: id,
          name: record.displayName,
          currency: record.currency ?? null,
          observations: c.observations,
          firstDate: c.firstDate,
          lastDate: c.lastDate,
          typicalSpacingWeekdays: c.typicalSpacing,
          gaps: c.gaps,
        };
      });
      const firsts = rows.map((r) => r.firstDate).filter((d): d is string => d !== null);
      const lasts = rows.map((r) => r.lastDate).filter((d): d is string => d !== null);
      return {
        firstDate: firsts.length ? firsts.reduce((a, b) => (b < a ? b : a)) : null,
        lastDate: lasts.length ? lasts.reduce((a, b) => (b > a ? b : a)) : null,
        minGapWeekdays,
        assets: rows,
        dataVersion: store.dataVersion(),
      };
    },
    async 'prices.series'({ assetId, window }) {
      const record = store.getAsset(assetId);
      if (!record) throw new ServiceFailure('not-found', `no asset '${assetId}' in the store`, 'assetId');
      const s = store.priceSeries(assetId);
      const dates: string[] = [];
      const closes: number[] = [];
      if (s)
        s.dates.forEach((d, i) => {
          if (window?.from !== undefined && d < window.from) return;
          if (window?.to !== undefined && d > window.to) return;
          if (!Number.isFinite(s.closes[i])) return;
          dates.push(d);
          closes.push(s.closes[i]);
        });
      return { asset: assetId, name: record.displayName, currency: record.currency ?? null, dates, closes };
    },
    async 'prices.table'({ assets, window }) {
      requireAssets(assets);
      const table = store.priceTable({ assets, from: window?.from, to: window?.to });
      return { table: priceTableToWire(table), dataVersion: store.dataVersion() };
    },
  };
}

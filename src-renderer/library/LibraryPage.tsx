import { api } from '../bridge.js';
import { ErrorNote, Loading } from '../app/notes.js';
import { href, navigate } from '../app/route.js';
import { useLoad } from '../app/use-load.js';
import { AssetTable } from './AssetTable.js';
import { CoveragePicture } from './CoveragePicture.js';
import { PriceChart } from './PriceChart.js';

/** The price library: universes, which asset has prices when, each asset's chart and tags. */
export function LibraryPage({ universeId, assetId }: { universeId?: string; assetId?: string }) {
  const universes = useLoad(() => api['universes.list']({}), []);
  const chosen = universeId ?? universes.data?.[0]?.id;

  return (
    <>
      <div className="page-head">
        <div>
          <h1>Price library</h1>
          <p className="muted">Universes of assets, their price histories and tags, as stored on this machine.</p>
        </div>
        <a className="button primary" href={href({ page: 'import' })}>
          Import a price file
        </a>
      </div>
      {universes.error ? <ErrorNote error={universes.error} /> : null}
      {universes.loading && !universes.data ? <Loading what="the universes" /> : null}
      {universes.data && universes.data.length === 0 ? (
        <div className="sheet">
          <p>
            The store holds no prices yet. <a href={href({ page: 'import' })}>Import a price file</a> (CSV, one column
            per asset or one row per price) to create a universe.
          </p>
        </div>
      ) : null}
      {universes.data && universes.data.length > 0 ? (
        <div className="columns">
          <nav aria-label="Universes">
            <h2
              className="faint"
              style={{ fontFamily: 'inherit', fontSize: '0.8rem', textTransform: 'uppercase', letterSpacing: '0.05em' }}
            >
              Universes
            </h2>
            <ul className="plain-list universe-list">
              {universes.data.map((u) => (
                <li key={u.id}>
                  <a
                    href={href({ page: 'library', universeId: u.id })}
                    aria-current={u.id === chosen ? 'page' : undefined}
                  >
                    <span>{u.name}</span>
                    <span className="faint tabular">{u.assetCount}</span>
                  </a>
                </li>
              ))}
            </ul>
          </nav>
          {chosen ? <UniverseView key={chosen} universeId={chosen} assetId={assetId} /> : null}
        </div>
      ) : null}
    </>
  );
}

function UniverseView({ universeId, assetId }: { universeId: string; assetId?: string }) {
  const universe = useLoad(() => api['universes.get']({ universeId }), [universeId]);
  const coverage = useLoad(() => api['prices.coverage']({ universeId }), [universeId]);
  const selected = assetId ?? universe.data?.members[0]?.asset.id;
  const series = useLoad(
    () => (selected ? api['prices.series']({ assetId: selected }) : Promise.resolve(undefined)),
    [selected],
  );
  const select = (asset: string) => navigate({ page: 'library', universeId, assetId: asset });

  if (universe.error) return <ErrorNote error={universe.error} />;
  if (!universe.data) return <Loading what="the universe" />;
  const u = universe.data.universe;
  return (
    <div>
      <h2>{u.name}</h2>
      {u.description ? <p className="muted">{u.description}</p> : null}
      <section className="section" aria-label="Coverage">
        {coverage.error ? <ErrorNote error={coverage.error} /> : null}
        {coverage.data ? (
          <CoveragePicture coverage={coverage.data} selected={selected} onSelect={select} />
        ) : (
          <Loading what="the coverage" />
        )}
      </section>
      <section className="section" aria-label="Price chart">
        {series.error ? <ErrorNote error={series.error} /> : null}
        {series.data ? <PriceChart series={series.data} /> : selected ? <Loading what="the prices" /> : null}
      </section>
      <AssetTable
        universeId={universeId}
        members={universe.data.members}
        coverage={coverage.data}
        selected={selected}
        onChanged={universe.reload}
      />
    </div>
  );
}

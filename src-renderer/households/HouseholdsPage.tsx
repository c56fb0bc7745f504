import { api } from '../bridge.js';
import { DataTable } from '../app/DataTable.js';
import { countOf } from '../../shared-core/present/format.js';
import { ErrorNote, Loading } from '../app/notes.js';
import { href } from '../app/route.js';
import { useLoad } from '../app/use-load.js';
import { formatCurrency, formatDate } from '../scenario/format.js';

/** The client list: every household with what it holds and how many scenarios it has. */
export function HouseholdsPage() {
  const households = useLoad(() => api['households.list']({}), []);
  return (
    <>
      <div className="page-head">
        <div>
          <h1>Households</h1>
          <p className="muted">The clients on this machine, with their current holdings and saved scenarios.</p>
        </div>
        <a className="button primary" href={href({ page: 'household-new' })}>
          New household
        </a>
      </div>
      {households.error ? <ErrorNote error={households.error} /> : null}
      {households.loading && !households.data ? <Loading what="the households" /> : null}
      {households.data && households.data.length === 0 ? (
        <div className="sheet">
          <p>
            No household yet. Create one to record its holdings and build scenarios for it; import price histories in
            the <a href={href({ page: 'library' })}>price library</a> first if the store has none.
          </p>
        </div>
      ) : null}
      {households.data && households.data.length > 0 ? (
        <DataTable
          caption={`${countOf(households.data.length, 'household')}; totals in each household's base currency at the stored exchange rates.`}
          rows={households.data}
          rowKey={(h) => h.id}
          empty="No household yet."
          columns={[
            {
              key: 'name',
              head: 'Household',
              rowHead: true,
              sortBy: (h) => h.name,
              cell: (h) => <a href={href({ page: 'household', householdId: h.id })}>{h.name}</a>,
            },
            { key: 'ref', head: 'Reference', cell: (h) => h.reference || <span className="faint">none</span> },
            { key: 'base', head: 'Base', className: 'code', cell: (h) => h.baseCurrency },
            {
              key: 'total',
              head: 'Holdings',
              num: true,
              cell: (h) =>
                h.holdingsTotal !== null ? (
                  formatCurrency(h.holdingsTotal, h.baseCurrency)
                ) : h.holdingsAsOf ? (
                  <span className="flag">no exchange rate</span>
                ) : (
                  <span className="faint">none on file</span>
                ),
            },
            {
              key: 'asof',
              head: 'As of',
              num: true,
              sortBy: (h) => h.holdingsAsOf ?? '',
              cell: (h) => (h.holdingsAsOf ? formatDate(h.holdingsAsOf) : '\u2013'),
            },
            { key: 'n', head: 'Scenarios', num: true, sortBy: (h) => h.scenarioCount, cell: (h) => h.scenarioCount },
          ]}
        />
      ) : null}
    </>
  );
}

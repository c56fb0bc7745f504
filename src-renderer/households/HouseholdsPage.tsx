import { api } from '../bridge.js';
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
        <table className="grid">
          <caption>
            {households.data.length} household{households.data.length === 1 ? '' : 's'}; totals in each household's base
            currency at the stored exchange rates.
          </caption>
          <thead>
            <tr>
              <th scope="col">Household</th>
              <th scope="col">Reference</th>
              <th scope="col">Base</th>
              <th scope="col" className="num">
                Holdings
              </th>
              <th scope="col" className="num">
                As of
              </th>
              <th scope="col" className="num">
                Scenarios
              </th>
            </tr>
          </thead>
          <tbody>
            {households.data.map((h) => (
              <tr key={h.id}>
                <th scope="row">
                  <a href={href({ page: 'household', householdId: h.id })}>{h.name}</a>
                </th>
                <td>{h.reference || <span className="faint">none</span>}</td>
                <td className="code">{h.baseCurrency}</td>
                <td className="num">
                  {h.holdingsTotal !== null ? (
                    formatCurrency(h.holdingsTotal, h.baseCurrency)
                  ) : h.holdingsAsOf ? (
                    <span className="flag">no exchange rate</span>
                  ) : (
                    <span className="faint">none on file</span>
                  )}
                </td>
                <td className="num">{h.holdingsAsOf ? formatDate(h.holdingsAsOf) : '\u2013'}</td>
                <td className="num">{h.scenarioCount}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </>
  );
}

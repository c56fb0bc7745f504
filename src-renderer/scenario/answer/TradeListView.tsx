import { memo } from 'react';
import type { Holdings } from '../../../shared-core/contract/service-api.js';
import { formatCurrency, formatDate, formatPercent } from '../format.js';
import { tradesFromHoldings } from '../trade-list.js';

/** The trades from the household's holdings to one candidate, in the base currency, rounded to the memo's lot. */
export const TradeListView = memo(function TradeListView(props: {
  candidateId: string;
  weights: Readonly<Record<string, number>>;
  holdings: Holdings | null;
  names: ReadonlyMap<string, string>;
  locale?: string;
}) {
  if (!props.holdings)
    return <p className="faint">The household has no holdings on file, so there is no trade list.</p>;
  const list = tradesFromHoldings(props.weights, props.holdings);
  if (!list.ok)
    return (
      <p className="note warning" role="note">
        No trade list: {list.reason}.
      </p>
    );
  const { currency, locale } = { currency: list.currency, locale: props.locale };
  const { plan } = list;
  const lines = plan.rows.filter((l) => l.trade !== 0);
  return (
    <div className="trade-list" data-testid="trade-list">
      <table className="grid">
        <caption>
          Trades from the holdings{list.asOf ? ` of ${formatDate(list.asOf, locale)}` : ''} to {props.candidateId},
          total {formatCurrency(plan.total, currency, locale)}, in lots of {formatCurrency(plan.lot, currency, locale)}
          {list.rates.length > 0 ? `; ${list.rates.join('; ')}` : ''}
        </caption>
        <thead>
          <tr>
            <th scope="col">Asset</th>
            <th scope="col">Trade</th>
            <th scope="col" className="num">
              Amount
            </th>
            <th scope="col" className="num">
              Held now
            </th>
            <th scope="col" className="num">
              After
            </th>
            <th scope="col" className="num">
              Weight now → after
            </th>
          </tr>
        </thead>
        <tbody>
          {lines.map((l) => (
            <tr key={l.asset}>
              <th scope="row">
                <span className="code">{l.asset}</span> <span className="faint">{props.names.get(l.asset) ?? ''}</span>
              </th>
              <td>{l.trade > 0 ? 'buy' : l.after === 0 ? 'sell all' : 'sell'}</td>
              <td className="num">{formatCurrency(Math.abs(l.trade), currency, locale)}</td>
              <td className="num">{formatCurrency(l.current, currency, locale)}</td>
              <td className="num">{formatCurrency(l.after, currency, locale)}</td>
              <td className="num">
                {formatPercent(l.current / plan.total, locale)} → {formatPercent(props.weights[l.asset] ?? 0, locale)}
              </td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <th scope="row">Together</th>
            <td colSpan={2} className="num">
              buys {formatCurrency(plan.buys, currency, locale)}, sells {formatCurrency(plan.sells, currency, locale)},
              cash left from rounding {formatCurrency(plan.residual, currency, locale)}
            </td>
            <td colSpan={3} className="faint">
              Amounts at holdings values; dealing prices and costs will differ.
            </td>
          </tr>
        </tfoot>
      </table>
    </div>
  );
});

import { memo } from 'react';
import type { Holdings } from '../../../shared-core/contract/service-api.js';
import { formatCurrency, formatDate, formatPercent } from '../format.js';
import { tradeList } from '../trade-list.js';

/** The trades from the household's holdings to one candidate, in the base currency. */
export const TradeListView = memo(function TradeListView(props: {
  candidateId: string;
  weights: Readonly<Record<string, number>>;
  holdings: Holdings | null;
  names: ReadonlyMap<string, string>;
  locale?: string;
}) {
  if (!props.holdings)
    return <p className="faint">The household has no holdings on file, so there is no trade list.</p>;
  const list = tradeList(props.weights, props.holdings);
  if (!list.ok)
    return (
      <p className="note warning" role="note">
        No trade list: {list.reason}.
      </p>
    );
  const { currency, locale } = { currency: list.currency, locale: props.locale };
  return (
    <div className="trade-list" data-testid="trade-list">
      <table className="grid">
        <caption>
          Trades from the holdings{list.asOf ? ` of ${formatDate(list.asOf, locale)}` : ''} to {props.candidateId},
          total {formatCurrency(list.total, currency, locale)}
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
          {list.lines.map((l) => (
            <tr key={l.asset}>
              <th scope="row">
                <span className="code">{l.asset}</span> <span className="faint">{props.names.get(l.asset) ?? ''}</span>
              </th>
              <td>{l.trade > 0 ? 'buy' : l.target < 1 ? 'sell all' : 'sell'}</td>
              <td className="num">{formatCurrency(Math.abs(l.trade), currency, locale)}</td>
              <td className="num">{formatCurrency(l.held, currency, locale)}</td>
              <td className="num">{formatCurrency(l.target, currency, locale)}</td>
              <td className="num">
                {formatPercent(l.heldWeight, locale)} → {formatPercent(l.targetWeight, locale)}
              </td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <th scope="row">Together</th>
            <td colSpan={2} className="num">
              buys {formatCurrency(list.bought, currency, locale)}, sells {formatCurrency(list.sold, currency, locale)}
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

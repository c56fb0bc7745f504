import { DataTable } from '../app/DataTable.js';
import { useId, useMemo, useState } from 'react';
import type { Asset, Holdings } from '../../shared-core/contract/service-api.js';
import { isIsoDate } from '../../shared-core/scenario/iso-date.js';
import { api } from '../bridge.js';
import { todayIso } from '../../shared-core/present/format.js';
import { ErrorNote, errorText, Loading } from '../app/notes.js';
import { href } from '../app/route.js';
import { useLoad } from '../app/use-load.js';
import { formatCurrency, formatDate, formatPercent } from '../scenario/format.js';
import { parseAmountInput } from './amount-input.js';

/** A household's current holdings: market values in currency as of a date, and their weights. */
export function HoldingsPanel({ householdId, onChanged }: { householdId: string; onChanged: () => void }) {
  const holdings = useLoad(() => api['holdings.get']({ householdId }), [householdId]);
  const assets = useLoad(() => api['assets.list']({}), []);
  const [editing, setEditing] = useState(false);

  const names = useMemo(() => new Map((assets.data ?? []).map((a) => [a.id, a.name])), [assets.data]);

  return (
    <section className="section" aria-labelledby="holdings-head">
      <div className="section-head">
        <h2 id="holdings-head">Current holdings</h2>
        {!editing && holdings.data ? (
          <button type="button" onClick={() => setEditing(true)}>
            {holdings.data.positions.length ? 'Edit holdings' : 'Enter holdings'}
          </button>
        ) : null}
      </div>
      {holdings.error ? <ErrorNote error={holdings.error} /> : null}
      {holdings.loading && !holdings.data ? <Loading what="the holdings" /> : null}
      {holdings.data && !editing ? <HoldingsTable holdings={holdings.data} names={names} /> : null}
      {holdings.data && editing ? (
        <HoldingsEditor
          holdings={holdings.data}
          assets={assets.data ?? []}
          onSaved={() => {
            setEditing(false);
            holdings.reload();
            onChanged();
          }}
          onCancel={() => setEditing(false)}
        />
      ) : null}
    </section>
  );
}

function HoldingsTable({ holdings, names }: { holdings: Holdings; names: Map<string, string> }) {
  if (holdings.positions.length === 0)
    return (
      <p className="muted">
        No holdings on file. Enter them to measure turnover against them and to size the trades in{' '}
        {holdings.baseCurrency}.
      </p>
    );
  const sorted = [...holdings.positions].sort((a, b) => (b.valueInBase ?? b.amount) - (a.valueInBase ?? a.amount));
  return (
    <>
      <DataTable
        caption={`Market values as of ${holdings.asOf ? formatDate(holdings.asOf) : 'an unknown date'}; weights of the total in ${holdings.baseCurrency}.`}
        rows={sorted}
        rowKey={(p) => p.asset}
        empty="No holdings on file."
        columns={[
          { key: 'asset', head: 'Asset', className: 'code', sortBy: (p) => p.asset, cell: (p) => p.asset },
          { key: 'name', head: 'Name', cell: (p) => names.get(p.asset) ?? '' },
          { key: 'amount', head: 'Amount', num: true, cell: (p) => formatCurrency(p.amount, p.currency) },
          {
            key: 'base',
            head: `In ${holdings.baseCurrency}`,
            num: true,
            sortBy: (p) => p.valueInBase ?? 0,
            cell: (p) =>
              p.valueInBase !== null ? (
                formatCurrency(p.valueInBase, holdings.baseCurrency)
              ) : (
                <span className="flag">no rate</span>
              ),
          },
          {
            key: 'weight',
            head: 'Weight',
            num: true,
            sortBy: (p) => p.weight ?? 0,
            cell: (p) => formatPercent(p.weight),
          },
        ]}
        foot={
          <tr>
            <th scope="row" colSpan={3}>
              Total, {holdings.positions.length} positions
            </th>
            <td className="num">
              {holdings.total !== null ? formatCurrency(holdings.total, holdings.baseCurrency) : '\u2013'}
            </td>
            <td className="num">{holdings.total !== null ? formatPercent(1) : '\u2013'}</td>
          </tr>
        }
      />
      {holdings.rates.length ? <p className="faint">Exchange rates: {holdings.rates.join('; ')}.</p> : null}
    </>
  );
}

interface Row {
  key: number;
  asset: string;
  amount: string;
  currency: string;
}

function HoldingsEditor({
  holdings,
  assets,
  onSaved,
  onCancel,
}: {
  holdings: Holdings;
  assets: Asset[];
  onSaved: () => void;
  onCancel: () => void;
}) {
  const id = useId();
  const known = useMemo(() => new Map(assets.map((a) => [a.id, a])), [assets]);
  const [asOf, setAsOf] = useState(holdings.asOf ?? todayIso());
  const [rows, setRows] = useState<Row[]>(() =>
    holdings.positions.length
      ? holdings.positions.map((p, i) => ({ key: i, asset: p.asset, amount: String(p.amount), currency: p.currency }))
      : [{ key: 0, asset: '', amount: '', currency: holdings.baseCurrency }],
  );
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<unknown>();
  const nextKey = Math.max(-1, ...rows.map((r) => r.key)) + 1;

  const rowReasons = rows.map((row, i) => {
    const asset = row.asset.trim();
    const amount = parseAmountInput(row.amount);
    return {
      asset: !asset
        ? 'choose an asset'
        : !known.has(asset)
          ? `no asset '${asset}' in the store`
          : rows.findIndex((r) => r.asset.trim() === asset) !== i
            ? 'this asset is listed twice'
            : undefined,
      amount: amount.ok ? undefined : amount.reason,
      currency: /^[A-Z]{3}$/.test(row.currency) ? undefined : 'ISO 4217 code, such as EUR',
      value: amount.ok ? amount.value : undefined,
    };
  });
  const dateReason = isIsoDate(asOf) ? undefined : 'a valid date';
  const valid = !dateReason && rowReasons.every((r) => !r.asset && !r.amount && !r.currency);

  const update = (key: number, change: Partial<Row>) =>
    setRows((rs) =>
      rs.map((r) => {
        if (r.key !== key) return r;
        const next = { ...r, ...change };
        // A newly chosen asset brings its own currency, the usual currency of its valuation.
        const chosen = change.asset !== undefined ? known.get(change.asset.trim()) : undefined;
        if (chosen?.currency && change.currency === undefined) next.currency = chosen.currency;
        return next;
      }),
    );

  const save = async () => {
    if (!valid) return;
    setBusy(true);
    setFailure(undefined);
    try {
      await api['holdings.set']({
        householdId: holdings.householdId,
        asOf,
        positions: rows.map((r, i) => ({
          asset: r.asset.trim(),
          amount: rowReasons[i].value ?? 0,
          currency: r.currency,
        })),
      });
      onSaved();
    } catch (error) {
      setFailure(error);
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="sheet">
      {assets.length === 0 ? (
        <p className="note warning">
          The store has no assets yet. <a href={href({ page: 'import' })}>Import a price file</a> first; holdings refer
          to its assets.
        </p>
      ) : null}
      <div className="field">
        <label htmlFor={`${id}-asof`}>Valued as of</label>
        <input
          id={`${id}-asof`}
          type="date"
          value={asOf}
          onChange={(e) => setAsOf(e.target.value)}
          aria-invalid={dateReason ? true : undefined}
        />
        {dateReason ? <div className="reason">{dateReason}</div> : null}
      </div>
      <datalist id={`${id}-assets`}>
        {assets.map((a) => (
          <option key={a.id} value={a.id}>
            {a.name}
          </option>
        ))}
      </datalist>
      <table className="grid" aria-label="Holdings being edited">
        <thead>
          <tr>
            <th scope="col">Asset</th>
            <th scope="col" className="num">
              Market value
            </th>
            <th scope="col">Currency</th>
            <th scope="col">
              <span className="faint">Row</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row, i) => {
            const why = rowReasons[i];
            return (
              <tr key={row.key}>
                <td>
                  <input
                    type="text"
                    list={`${id}-assets`}
                    aria-label={`Asset of row ${i + 1}`}
                    value={row.asset}
                    onChange={(e) => update(row.key, { asset: e.target.value })}
                    aria-invalid={row.asset && why.asset ? true : undefined}
                    size={18}
                  />
                  {row.asset && why.asset ? <div className="reason">{why.asset}</div> : null}
                  {known.get(row.asset.trim()) ? <div className="hint">{known.get(row.asset.trim())?.name}</div> : null}
                </td>
                <td className="num">
                  <input
                    type="text"
                    inputMode="decimal"
                    className="amount"
                    aria-label={`Market value of row ${i + 1}`}
                    value={row.amount}
                    onChange={(e) => update(row.key, { amount: e.target.value })}
                    aria-invalid={row.amount && why.amount ? true : undefined}
                  />
                  {row.amount && why.amount ? <div className="reason">{why.amount}</div> : null}
                  {why.value !== undefined ? (
                    <div className="hint">{formatCurrency(why.value, row.currency)}</div>
                  ) : null}
                </td>
                <td>
                  <input
                    type="text"
                    aria-label={`Currency of row ${i + 1}`}
                    value={row.currency}
                    maxLength={3}
                    size={5}
                    onChange={(e) => update(row.key, { currency: e.target.value.toUpperCase() })}
                    aria-invalid={why.currency ? true : undefined}
                  />
                  {why.currency ? <div className="reason">{why.currency}</div> : null}
                </td>
                <td>
                  <button
                    type="button"
                    className="quiet"
                    aria-label={`Remove row ${i + 1}`}
                    onClick={() => setRows((rs) => rs.filter((r) => r.key !== row.key))}
                  >
                    Remove
                  </button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {failure ? (
        <p className="note error" role="alert">
          {errorText(failure)}
        </p>
      ) : null}
      <div className="actions" style={{ marginTop: '0.8rem' }}>
        <button
          type="button"
          onClick={() =>
            setRows((rs) => [...rs, { key: nextKey, asset: '', amount: '', currency: holdings.baseCurrency }])
          }
        >
          Add a position
        </button>
        <button type="button" className="primary" onClick={save} disabled={!valid || busy}>
          Save holdings
        </button>
        <button type="button" onClick={onCancel} disabled={busy}>
          Discard changes
        </button>
        {!valid ? <span className="faint">Fix the marked fields to save.</span> : null}
      </div>
    </div>
  );
}

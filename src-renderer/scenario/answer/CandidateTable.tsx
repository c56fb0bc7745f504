import { memo } from 'react';
import {
  isSolved,
  type CandidateMetrics,
  type CandidateResult,
  type OptimalCandidate,
} from '../../../shared-core/optimise/result.js';
import { candidateColour } from '../../../shared-core/present/palette.js';
import { formatDuration, formatPercent, formatRatio } from '../format.js';

/**
 * The answer, side by side: one column per candidate, the figures an advisor compares first,
 * then every asset's weight against the current one. An infeasible candidate keeps its column and
 * shows the solver's explanation in it, in words and with an amber marker.
 */
export interface CandidateTableProps {
  assets: readonly string[];
  names: ReadonlyMap<string, string>;
  candidates: readonly CandidateResult[];
  /** Position of each candidate in the scenario (its colour). */
  colourIndex: (id: string) => number;
  current: Readonly<Record<string, number>>;
  /** The current weights' figures under one candidate's estimate, where they can be computed. */
  currentMetrics: { metrics: CandidateMetrics; basis: string } | { metrics: null; reason: string };
  recommended?: string;
  focused?: string;
  onRecommend: (id: string | undefined) => void;
  onFocus: (id: string) => void;
  describe: (id: string) => string;
  locale?: string;
}

export function solved(c: CandidateResult): c is OptimalCandidate {
  return c.status === 'optimal';
}

/** The figures of a candidate with weights (an iteration-limit stop has them too). */
const figures = (c: CandidateResult) => (isSolved(c) ? c.metrics : undefined);

function StatusLine({ c }: { c: CandidateResult }) {
  if (c.status === 'optimal') return <span className="status ok">solved</span>;
  const word =
    c.status === 'infeasible'
      ? 'Infeasible'
      : c.status === 'iteration-limit'
        ? 'Stopped at the iteration limit'
        : 'Not solved';
  return (
    <span className="status warn">
      <span className="marker" aria-hidden="true">
        ◆
      </span>{' '}
      {word}
    </span>
  );
}

export const CandidateTable = memo(function CandidateTable(props: CandidateTableProps) {
  const { assets, candidates, current, locale } = props;
  type Row = { label: string; unit: string; value: (m: CandidateMetrics | null | undefined) => string };
  const metricRows: Row[] = [
    { label: 'Volatility', unit: 'annualised', value: (m) => formatPercent(m?.volatility, locale) },
    {
      label: 'Diversification ratio',
      unit: 'w′σ / √(w′Σw)',
      value: (m) => formatRatio(m?.diversificationRatio, locale),
    },
    { label: 'Effective bets', unit: 'of risk', value: (m) => formatRatio(m?.effectiveBets, locale) },
    { label: 'Effective holdings', unit: '1 / Σw²', value: (m) => formatRatio(m?.effectiveHoldings, locale) },
    { label: 'Turnover', unit: 'Σ|w − current|', value: (m) => formatPercent(m?.turnover, locale) },
  ];
  const cm = props.currentMetrics;
  const anyFailed = candidates.some((c) => !solved(c));
  return (
    <div className="table-scroll comparison-scroll">
      <table className="grid comparison" data-testid="comparison-table">
        <caption>
          {candidates.length === 1 ? 'One candidate' : `${candidates.length} candidates, one column each`}; weights in
          per cent of the portfolio. Press a column's “Show” button to draw it in the charts below.{' '}
          {cm.metrics ? `Current figures ${cm.basis}.` : `Current figures: ${cm.reason}.`}
        </caption>
        <thead>
          <tr>
            <th scope="col" className="row-head">
              Asset
            </th>
            <th scope="col" className="num current-col">
              Current
            </th>
            {candidates.map((c) => {
              const recommended = props.recommended === c.id;
              return (
                <th
                  key={c.id}
                  scope="col"
                  className={`candidate-head${props.focused === c.id ? ' focused' : ''}`}
                  data-candidate={c.id}
                  data-status={c.status}
                >
                  <span
                    className="swatch"
                    style={{ background: candidateColour(props.colourIndex(c.id)) }}
                    aria-hidden="true"
                  />
                  <span className="candidate-id code">{c.id}</span>
                  <span className="candidate-label">{props.describe(c.id)}</span>
                  <StatusLine c={c} />
                  {recommended ? <span className="recommended-mark">★ Recommended</span> : null}
                  <span className="head-actions">
                    <button
                      type="button"
                      className="quiet"
                      aria-pressed={props.focused === c.id}
                      onClick={() => props.onFocus(c.id)}
                    >
                      Show<span className="visually-hidden"> {c.id} in the charts</span>
                    </button>
                    <button
                      type="button"
                      className="quiet"
                      aria-pressed={recommended}
                      disabled={!solved(c) && !recommended}
                      onClick={() => props.onRecommend(recommended ? undefined : c.id)}
                    >
                      {recommended ? 'Withdraw' : 'Recommend'}
                      <span className="visually-hidden"> {c.id}</span>
                    </button>
                  </span>
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody className="metrics">
          {metricRows.map((row) => (
            <tr key={row.label}>
              <th scope="row" className="row-head">
                {row.label} <span className="faint">{row.unit}</span>
              </th>
              <td
                className={`num current-col${cm.metrics ? '' : ' faint'}`}
                data-candidate="current"
                data-metric={row.label}
                title={cm.metrics ? cm.basis : cm.reason}
              >
                {cm.metrics ? row.value(cm.metrics) : '–'}
              </td>
              {candidates.map((c) =>
                solved(c) ? (
                  <td key={c.id} className="num" data-candidate={c.id} data-metric={row.label}>
                    {row.value(figures(c))}
                  </td>
                ) : (
                  <td key={c.id} className="num faint">
                    –
                  </td>
                ),
              )}
            </tr>
          ))}
          <tr>
            <th scope="row" className="row-head">
              Solver <span className="faint">iterations, KKT residual, time</span>
            </th>
            <td className="current-col" />
            {candidates.map((c) => (
              <td key={c.id} className="num faint solver-cell">
                {c.solver.iterations} it · {c.solver.kktResidual.toExponential(0)} · {formatDuration(c.solver.ms)}
              </td>
            ))}
          </tr>
        </tbody>
        {anyFailed ? (
          <tbody className="explanations">
            <tr>
              <th scope="row" className="row-head">
                Why not solved
              </th>
              <td className="current-col" />
              {candidates.map((c) =>
                solved(c) ? (
                  <td key={c.id} />
                ) : (
                  <td key={c.id} className="infeasible-note" data-candidate={c.id}>
                    <span className="marker" aria-hidden="true">
                      ◆
                    </span>{' '}
                    {c.message ?? 'the solver gave no reason'}
                  </td>
                ),
              )}
            </tr>
          </tbody>
        ) : null}
        <tbody className="weights">
          {assets.map((a) => (
            <tr key={a}>
              <th scope="row" className="row-head">
                <span className="code">{a}</span> <span className="faint asset-name">{props.names.get(a) ?? ''}</span>
              </th>
              <td className="num current-col">{formatPercent(current[a] ?? 0, locale)}</td>
              {candidates.map((c) => {
                if (!solved(c))
                  return (
                    <td key={c.id} className="num faint">
                      –
                    </td>
                  );
                const w = c.weights[a] ?? 0;
                const delta = w - (current[a] ?? 0);
                return (
                  <td key={c.id} className="num weight-cell" data-candidate={c.id} data-asset={a} data-weight={w}>
                    <span className="inline-bar" aria-hidden="true">
                      <span
                        style={{
                          width: `${Math.min(100, Math.max(0, w * 100 * 4))}%`,
                          background: candidateColour(props.colourIndex(c.id)),
                        }}
                      />
                    </span>
                    {formatPercent(w, locale)}
                    <span className={`delta${Math.abs(delta) < 5e-4 ? ' none' : ''}`}>
                      {Math.abs(delta) < 5e-4
                        ? ''
                        : `${delta > 0 ? '+' : '−'}${formatPercent(Math.abs(delta), locale)}`}
                    </span>
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
});

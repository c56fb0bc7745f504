import { memo, useDeferredValue, useLayoutEffect, useMemo, useState } from 'react';
import type { Holdings } from '../../../shared-core/contract/service-api.js';
import type { Scenario } from '../../../shared-core/scenario/schema.js';
import { CandidateScatter, type ScatterPoint } from '../../charts/CandidateScatter.js';
import { CorrelationHeatmap } from '../../charts/CorrelationHeatmap.js';
import { EstimateDifferenceChart } from '../../charts/EstimateDifferenceChart.js';
import { candidateColour, candidateSymbol } from '../../../shared-core/present/palette.js';
import { RiskContributionChart, sortByTarget, WeightsChart } from '../../charts/WeightsChart.js';
import { sameNumberRecord, sameNumbers, sameRows, sameStrings, useStable } from '../../charts/use-stable.js';
import type { Comparison, EstimateView } from '../../worker/comparison.js';
import { describeEstimator } from '../candidate-grid.js';
import { daysInLocale } from '../../../shared-core/present/format.js';
import { formatDate } from '../format.js';
import { CandidateTable, solved } from './CandidateTable.js';
import { currentFigures } from './current-figures.js';
import { TradeListView } from './TradeListView.js';

/**
 * The second part of the page: the candidates side by side, then the pictures of the one in
 * focus (weights, risk, correlations of its estimate, trades) and of all of them together (the
 * volatility and diversification scatter, how far the estimates move from the sample).
 */
export interface AnswerProps {
  comparison: Comparison;
  /** The scenario the comparison was computed for. */
  scenario: Scenario;
  recommended?: string;
  focused?: string;
  onFocus: (id: string) => void;
  onRecommend: (id: string | undefined) => void;
  holdings: Holdings | null;
  names: ReadonlyMap<string, string>;
  locale?: string;
  /** True while the comparison is from an earlier edit (a recompute runs or the last edit failed). */
  stale: boolean;
  /** Called once the browser has painted the charts drawn for `comparison` (the page's own measure). */
  onChartsDrawn?: (comparison: Comparison, at: number) => void;
}

function sameEstimate(a: EstimateView | undefined, b: EstimateView | undefined): boolean {
  if (!a || !b) return a === b;
  return (
    a.key === b.key &&
    a.label === b.label &&
    sameNumbers(a.order, b.order) &&
    sameNumbers(a.volatilities, b.volatilities) &&
    sameNumbers(a.correlation, b.correlation) &&
    sameNumbers(a.distance.volatilityRatio, b.distance.volatilityRatio)
  );
}

export function basisOf(comparison: Comparison, scenario: Scenario, locale?: string): string {
  const w = comparison.window;
  const span = w.first && w.last ? `${formatDate(w.first, locale)} to ${formatDate(w.last, locale)}` : 'no dates';
  const frequency = scenario.returns.frequency[0].toUpperCase() + scenario.returns.frequency.slice(1);
  return `${frequency} ${scenario.returns.method} returns, ${span} (${w.observations} periods).`;
}

const NO_HOLDINGS: Readonly<Record<string, number>> = {};

/**
 * Colour position and label of each candidate, as functions that stay the same object while the
 * scenario's candidates keep their ids and labels (so a cap edit redraws no chart for them).
 */
function useNaming(scenario: Scenario) {
  const labels = scenario.candidates.map(
    (c) => [c.id, c.label ?? `${c.objective.method} · ${describeEstimator(c.estimator)}`] as const,
  );
  const key = labels.map(([id, label]) => `${id}\t${label}`).join('\n');
  // Keyed on `key`, the content of `labels`.
  return useMemo(() => {
    const order = new Map(labels.map(([id], i) => [id, i]));
    const text = new Map(labels);
    return {
      colourIndex: (id: string) => order.get(id) ?? 0,
      describe: (id: string) => text.get(id) ?? id,
    };
  }, [key]);
}

export const AnswerSection = memo(function AnswerSection(props: AnswerProps) {
  const { locale } = props;
  // The table shows a new result at once; the pictures below follow in a deferred render, so the
  // figures an advisor reads first are never held back by chart drawing. Everything the charts
  // get is kept as the same object while its content is unchanged, so a chart whose figures an
  // edit did not move neither renders nor redraws.
  const comparison = useDeferredValue(props.comparison);
  const scenario = useDeferredValue(props.scenario);
  // When the deferred render has caught up, the charts have their new options (EChart sets them in
  // its layout effect, before this one) and draw them in their next frame callback; one queued from
  // here runs in that frame after theirs, and a task from it after the frame is painted. (A chart
  // that this render mounts is created after the paint instead, so on opening the page, or when a
  // candidate first solves, this moment can come before its first picture.)
  const { onChartsDrawn } = props;
  useLayoutEffect(() => {
    if (comparison !== props.comparison || !onChartsDrawn) return;
    requestAnimationFrame(() => setTimeout(() => onChartsDrawn(comparison, performance.now()), 0));
  }, [comparison, props.comparison, onChartsDrawn]);
  const table = useNaming(props.scenario);
  const { colourIndex, describe } = useNaming(scenario);
  const assets = useStable(comparison.assets, sameStrings);
  const solvedCandidates = useMemo(() => comparison.candidates.filter(solved), [comparison]);
  const focus =
    solvedCandidates.find((c) => c.id === props.focused) ??
    solvedCandidates.find((c) => c.id === props.recommended) ??
    solvedCandidates[0];
  const estimateOfFocus = focus ? comparison.estimateOf[focus.id] : undefined;
  const [chosenEstimate, setChosenEstimate] = useState<string | undefined>(undefined);
  const heatKey =
    chosenEstimate && comparison.estimates.some((e) => e.key === chosenEstimate) ? chosenEstimate : estimateOfFocus;
  const heatNow = comparison.estimates.find((e) => e.key === heatKey) ?? comparison.estimates[0];
  const heat = useStable<EstimateView | undefined>(heatNow, sameEstimate);
  const estimates = useStable(
    comparison.estimates,
    (a, b) => a.length === b.length && a.every((e, i) => sameEstimate(e, b[i])),
  );
  const basis = basisOf(props.comparison, props.scenario, locale);
  const chartBasis = basisOf(comparison, scenario, locale);
  const current = useStable(scenario.current ?? NO_HOLDINGS, sameNumberRecord);
  const currentNow = useMemo(
    () => currentFigures(props.comparison, props.scenario.current, props.recommended),
    [props.comparison, props.scenario.current, props.recommended],
  );
  const focusWeights = useStable(focus?.weights ?? NO_HOLDINGS, sameNumberRecord);

  const weightRows = useStable(
    focus
      ? assets.map((a) => ({
          asset: a,
          name: props.names.get(a) ?? '',
          current: current[a] ?? 0,
          target: focus.weights[a] ?? 0,
        }))
      : [],
    sameRows,
  );
  const riskRows = useStable(
    focus?.metrics
      ? assets.map((a) => ({
          asset: a,
          name: props.names.get(a) ?? '',
          weight: focus.weights[a] ?? 0,
          contribution: focus.metrics?.riskContributions[a] ?? 0,
        }))
      : [],
    sameRows,
  );
  const order = useMemo(() => sortByTarget(weightRows).map((r) => r.asset), [weightRows]);
  const points: ScatterPoint[] = useStable(
    solvedCandidates.map((c) => ({
      id: c.id,
      label: describe(c.id),
      colour: candidateColour(colourIndex(c.id)),
      symbol: candidateSymbol(colourIndex(c.id)),
      volatility: c.metrics?.volatility ?? 0,
      diversificationRatio: c.metrics?.diversificationRatio ?? 0,
    })),
    sameRows,
  );

  return (
    <section
      className={`section answer${props.stale ? ' stale' : ''}`}
      aria-labelledby="answer-title"
      aria-busy={props.stale}
    >
      <div className="section-head">
        <h2 id="answer-title">2. The candidates</h2>
        <span className="faint">{basis}</span>
      </div>
      {props.comparison.window.warnings.length > 0 ? (
        <div className="note warning data-warnings" role="note">
          <strong>About the data:</strong>
          <ul>
            {props.comparison.window.warnings.map((w, k) => (
              <li key={k}>{daysInLocale(w, props.locale)}</li>
            ))}
          </ul>
        </div>
      ) : null}
      <CandidateTable
        assets={props.comparison.assets}
        names={props.names}
        candidates={props.comparison.candidates}
        colourIndex={table.colourIndex}
        current={props.scenario.current ?? NO_HOLDINGS}
        currentMetrics={currentNow}
        recommended={props.recommended}
        focused={focus?.id}
        onFocus={props.onFocus}
        onRecommend={props.onRecommend}
        describe={table.describe}
        locale={locale}
      />
      {focus ? (
        <>
          <h3 className="focus-title">
            <span
              className="swatch"
              style={{ background: candidateColour(colourIndex(focus.id)) }}
              aria-hidden="true"
            />
            In focus: <span className="code">{focus.id}</span> {describe(focus.id)}
            {props.recommended === focus.id ? <span className="recommended-mark">★ Recommended</span> : null}
          </h3>
          <div className="chart-pair">
            <WeightsChart
              candidateLabel={focus.id}
              colour={candidateColour(colourIndex(focus.id))}
              rows={weightRows}
              basis={chartBasis}
              locale={locale}
            />
            <RiskContributionChart
              candidateLabel={focus.id}
              colour={candidateColour(colourIndex(focus.id))}
              rows={riskRows}
              order={order}
              basis={chartBasis}
              locale={locale}
            />
          </div>
          <h3>Trades</h3>
          <TradeListView
            candidateId={focus.id}
            weights={focusWeights}
            holdings={props.holdings}
            names={props.names}
            locale={locale}
          />
        </>
      ) : (
        <p className="note warning">
          <span className="marker" aria-hidden="true">
            ◆
          </span>{' '}
          No candidate solved; each column above says why.
        </p>
      )}
      <h3>All candidates and their risk estimates</h3>
      <div className="chart-pair">
        <CandidateScatter points={points} basis={chartBasis} locale={locale} />
        <EstimateDifferenceChart assets={assets} estimates={estimates} basis={chartBasis} locale={locale} />
      </div>
      {heat ? (
        <div className="heat-block">
          <label className="inline-select">
            Correlations of{' '}
            <select value={heat.key} onChange={(e) => setChosenEstimate(e.target.value)}>
              {comparison.estimates.map((e) => (
                <option key={e.key} value={e.key}>
                  {e.label}
                </option>
              ))}
            </select>
          </label>
          <CorrelationHeatmap
            assets={assets}
            correlation={heat.correlation}
            order={heat.order}
            estimateLabel={heat.label}
            basis={chartBasis}
            locale={locale}
          />
        </div>
      ) : null}
    </section>
  );
});

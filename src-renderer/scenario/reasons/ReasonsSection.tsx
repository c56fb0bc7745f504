import { DataTable } from '../../app/DataTable.js';
import { memo, type ReactNode } from 'react';
import type { CandidateResult } from '../../../shared-core/optimise/result.js';
import { candidateColour } from '../../../shared-core/present/palette.js';
import { formatPercent } from '../format.js';

/**
 * The third part: the reasons behind each candidate, as the solver's optimality conditions give
 * them. Why each asset is in or out (its correlation with the portfolio against the 1/DR
 * threshold, or the limit it sits at), and what each binding limit costs in the objective's units.
 * Further evidence (walk-forward, stress) joins this part as its own subsection.
 */
export const ReasonsSection = memo(function ReasonsSection(props: {
  candidates: readonly CandidateResult[];
  focused?: string;
  onFocus: (id: string) => void;
  colourIndex: (id: string) => number;
  locale?: string;
  children?: ReactNode;
}) {
  const focus = props.candidates.find((c) => c.id === props.focused) ?? props.candidates[0];
  return (
    <section className="section reasons" aria-labelledby="reasons-title">
      <div className="section-head">
        <h2 id="reasons-title">3. The reasons</h2>
        <span className="faint">From the solver’s optimality conditions; figures are estimates from past data.</span>
      </div>
      <div className="actions candidate-switch" role="group" aria-label="Candidate whose reasons are shown">
        {props.candidates.map((c) => (
          <button
            key={c.id}
            type="button"
            aria-pressed={focus?.id === c.id}
            onClick={() => props.onFocus(c.id)}
            className={focus?.id === c.id ? 'primary' : undefined}
          >
            <span
              className="swatch"
              style={{ background: candidateColour(props.colourIndex(c.id)) }}
              aria-hidden="true"
            />
            {c.id}
          </button>
        ))}
      </div>
      {focus ? <Reasons candidate={focus} locale={props.locale} /> : null}
      {props.children}
    </section>
  );
});

function Reasons({ candidate, locale }: { candidate: CandidateResult; locale?: string }) {
  if (candidate.status !== 'optimal')
    return (
      <div className="note warning" data-testid="reasons-infeasible">
        <span className="marker" aria-hidden="true">
          ◆
        </span>{' '}
        <strong>
          {candidate.id} was not solved ({candidate.status}).
        </strong>{' '}
        {candidate.message ?? ''}
      </div>
    );
  const ex = candidate.explanations;
  if (!ex) return <p className="faint">The solver gave no explanations for {candidate.id}.</p>;
  const held = ex.assets.filter((a) => a.weight > 5e-4);
  const out = ex.assets.filter((a) => a.weight <= 5e-4);
  return (
    <div className="reasons-body" data-testid="reasons">
      {ex.flags.length > 0 ? (
        <ul className="note warning flags">
          {ex.flags.map((f, i) => (
            <li key={i}>{f}</li>
          ))}
        </ul>
      ) : null}
      <div className="reason-columns">
        <div>
          <h3>What each limit costs</h3>
          <DataTable
            caption={`Binding limits of ${candidate.id} and their shadow prices`}
            rows={ex.binding}
            rowKey={(b, i) => `${i}-${b.constraint}`}
            empty={`No limit binds: loosening any of them would not change ${candidate.id}.`}
            columns={[
              { key: 'limit', head: 'Limit', rowHead: true, cell: (b) => b.constraint },
              {
                key: 'price',
                head: 'Shadow price',
                num: true,
                sortBy: (b) => b.shadowPrice,
                cell: (b) => (
                  <>
                    {b.shadowPrice.toPrecision(3)} <span className="faint">{b.objectiveUnit}</span>
                  </>
                ),
              },
              { key: 'words', head: 'In words', cell: (b) => b.text },
            ]}
          />
        </div>
        <div>
          <h3>
            Why each asset is in ({held.length}) or out ({out.length})
          </h3>
          <DataTable
            caption={`Each asset of ${candidate.id}, held assets first`}
            rows={[...held, ...out]}
            rowKey={(a) => a.asset}
            rowProps={(a) => ({ 'data-asset': a.asset })}
            empty="No asset."
            columns={[
              {
                key: 'asset',
                head: 'Asset',
                rowHead: true,
                className: 'code',
                sortBy: (a) => a.asset,
                cell: (a) => a.asset,
              },
              {
                key: 'weight',
                head: 'Weight',
                num: true,
                sortBy: (a) => a.weight,
                cell: (a) => formatPercent(a.weight, locale),
              },
              { key: 'reason', head: 'Reason', cell: (a) => a.text },
            ]}
          />
        </div>
      </div>
    </div>
  );
}

import type { CellProblem, ImportReport } from '../../shared-core/contract/service-api.js';
import { formatDate, formatSignedPercent } from '../scenario/format.js';

function where(p: CellProblem): string {
  if (p.line === null) return 'the file';
  return p.column !== null ? `line ${p.line}, column ${p.column}` : `line ${p.line}`;
}

function Problems({ title, problems }: { title: string; problems: CellProblem[] }) {
  if (problems.length === 0) return null;
  const shown = problems.slice(0, 50);
  return (
    <div className="note error">
      <strong>
        {title} ({problems.length.toLocaleString()})
      </strong>
      <ul style={{ margin: '0.3rem 0 0', paddingLeft: '1.2rem' }}>
        {shown.map((p, i) => (
          <li key={i}>
            <span className="tabular">{where(p)}</span>: {p.message}
          </li>
        ))}
      </ul>
      {problems.length > shown.length ? <p className="faint">and {problems.length - shown.length} more.</p> : null}
    </div>
  );
}

const LAYOUT_WORDS = { wide: 'one column per asset', long: 'one row per price (date, asset, close)' } as const;
const DATE_WORDS = { iso: 'ISO (2024-12-31)', 'day-first': 'day first', 'month-first': 'month first' } as const;

/** What a price file holds, per asset, before anything is written. */
export function ImportReportView({ report }: { report: ImportReport }) {
  return (
    <div aria-label="Validation report">
      <dl className="facts" style={{ marginBottom: '0.8rem' }}>
        <dt>Layout</dt>
        <dd>{LAYOUT_WORDS[report.layout]}</dd>
        <dt>Separator, decimal mark</dt>
        <dd>
          {report.delimiter}, {report.decimal === 'comma' ? 'decimal comma' : 'decimal point'}
        </dd>
        <dt>Dates</dt>
        <dd>
          {report.dateOrder ? DATE_WORDS[report.dateOrder] : 'not recognised'}
          {report.dateOrderAmbiguous ? (
            <>
              {' '}
              <span className="flag">ambiguous: choose below</span>
            </>
          ) : null}
        </dd>
        <dt>Rows read</dt>
        <dd className="tabular">{report.rows.toLocaleString()}</dd>
      </dl>
      <Problems title="Problems that stop the import" problems={report.errors} />
      {report.assets.length ? (
        <table className="grid" aria-label="Per asset">
          <caption>
            Per asset. One-day moves beyond {formatSignedPercent(report.suspiciousMoveThreshold).replace('+', '\u00b1')}{' '}
            are flagged for a look, not rejected.
          </caption>
          <thead>
            <tr>
              <th scope="col">Asset</th>
              <th scope="col" className="num">
                Rows
              </th>
              <th scope="col" className="num">
                First
              </th>
              <th scope="col" className="num">
                Last
              </th>
              <th scope="col" className="num">
                Missing days
              </th>
              <th scope="col">Problems</th>
              <th scope="col">Large moves</th>
              <th scope="col" className="num">
                New dates
              </th>
              <th scope="col" className="num">
                Changed
              </th>
            </tr>
          </thead>
          <tbody>
            {report.assets.map((a) => {
              const problems = [
                a.nonPositive.length ? `${a.nonPositive.length} not above zero` : '',
                a.unparseableCount ? `${a.unparseableCount} unreadable` : '',
                a.repeatedDates.length ? `${a.repeatedDates.length} repeated dates` : '',
              ].filter(Boolean);
              return (
                <tr key={a.asset}>
                  <td className="code">
                    {a.asset} {a.isNewAsset ? <span className="tag">new</span> : null}
                  </td>
                  <td className="num">{a.rows.toLocaleString()}</td>
                  <td className="num">{a.firstDate ? formatDate(a.firstDate) : '\u2013'}</td>
                  <td className="num">{a.lastDate ? formatDate(a.lastDate) : '\u2013'}</td>
                  <td className="num">{a.missingDays.toLocaleString()}</td>
                  <td>
                    {problems.length ? (
                      <span className="flag bad">{problems.join(', ')}</span>
                    ) : (
                      <span className="faint">none</span>
                    )}
                    {[...a.nonPositive, ...a.unparseable].slice(0, 5).map((p, i) => (
                      <div key={i} className="reason">
                        {where(p)}: {p.message}
                      </div>
                    ))}
                  </td>
                  <td>
                    {a.suspiciousMoves.length ? (
                      <span
                        className="flag"
                        title={a.suspiciousMoves
                          .map((m) => `${formatDate(m.date)} ${formatSignedPercent(m.move)}`)
                          .join('\n')}
                      >
                        {a.suspiciousMoves.length}:{' '}
                        {a.suspiciousMoves
                          .slice(0, 2)
                          .map((m) => `${formatDate(m.date)} ${formatSignedPercent(m.move)}`)
                          .join(', ')}
                        {a.suspiciousMoves.length > 2 ? ', …' : ''}
                      </span>
                    ) : (
                      <span className="faint">none</span>
                    )}
                  </td>
                  <td className="num">{a.newDates.toLocaleString()}</td>
                  <td
                    className="num"
                    title={a.changes
                      .map((c) => `${formatDate(c.date)}: stored ${c.stored}, file ${c.incoming}`)
                      .join('\n')}
                  >
                    {a.changedValues ? <span className="flag">{a.changedValues.toLocaleString()}</span> : '0'}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      ) : null}
    </div>
  );
}

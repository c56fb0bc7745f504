import { DataTable } from '../app/DataTable.js';
import { useId } from 'react';
import type { Coverage } from '../../shared-core/contract/service-api.js';
import { formatDate } from '../scenario/format.js';
import { commonSpan, coverageFinding, dayNumber, isSparse, runsOf, yearTicks } from './coverage-layout.js';
import {
  ACCENT,
  ACCENT_WASH,
  AMBER,
  AMBER_WASH,
  INK,
  INK_SOFT,
  PAPER_DEEP,
  RULE,
  RULE_SOFT,
  SHEET,
} from '../../shared-core/present/palette.js';

const WIDTH = 1000;
const LABEL = 150;
const RIGHT = 16;
const ROW = 20;
const TOP = 26;

/**
 * Which asset has prices when: one row per asset, a solid bar where it is priced, an amber
 * hatched block where a gap is, nothing before its first price. The band where every asset has
 * prices is shaded behind the rows. Below, the same figures as a table for keyboard and
 * screen-reader users.
 */
export function CoveragePicture({
  coverage,
  selected,
  onSelect,
}: {
  coverage: Coverage;
  selected?: string;
  onSelect?: (asset: string) => void;
}) {
  const id = useId().replace(/:/g, '');
  const finding = coverageFinding(coverage);
  if (!coverage.firstDate || !coverage.lastDate)
    return (
      <div className="chart-box">
        <p className="chart-title">{finding}</p>
      </div>
    );
  const start = dayNumber(coverage.firstDate);
  const end = Math.max(dayNumber(coverage.lastDate), start + 1);
  const x = (iso: string) => LABEL + ((dayNumber(iso) - start) / (end - start)) * (WIDTH - LABEL - RIGHT);
  const height = TOP + coverage.assets.length * ROW + 8;
  const span = commonSpan(coverage);

  return (
    <figure className="chart-box" style={{ margin: 0 }} aria-labelledby={`${id}-title`}>
      <p className="chart-title" id={`${id}-title`}>
        {finding}
      </p>
      <p className="chart-basis">
        Stored closing prices, {formatDate(coverage.firstDate)} to {formatDate(coverage.lastDate)}. A gap is more than{' '}
        {coverage.minGapWeekdays} weekdays without a price and longer than the asset's usual spacing; assets priced once
        a month are marked “monthly”.
      </p>
      <svg
        viewBox={`0 0 ${WIDTH} ${height}`}
        width="100%"
        role="img"
        aria-label={`Coverage picture. ${finding}`}
        data-testid="coverage-picture"
      >
        <defs>
          <pattern id={`${id}-hatch`} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <rect width="6" height="6" fill={AMBER_WASH} />
            <line x1="0" y1="0" x2="0" y2="6" stroke={AMBER} strokeWidth="2.2" />
          </pattern>
        </defs>
        {span ? (
          <rect
            x={x(span.from)}
            y={TOP - 4}
            width={Math.max(1, x(span.to) - x(span.from))}
            height={coverage.assets.length * ROW + 4}
            fill={ACCENT_WASH}
          />
        ) : null}
        {yearTicks(coverage.firstDate, coverage.lastDate).map((t) => (
          <g key={t}>
            <line x1={x(t)} x2={x(t)} y1={TOP - 6} y2={height - 4} stroke={RULE} strokeWidth="1" />
            <text x={x(t)} y={TOP - 10} fontSize="11" textAnchor="middle" fill={INK_SOFT}>
              {t.slice(0, 4)}
            </text>
          </g>
        ))}
        {coverage.assets.map((a, row) => {
          const y = TOP + row * ROW;
          const isSelected = a.asset === selected;
          return (
            <g
              key={a.asset}
              onClick={onSelect ? () => onSelect(a.asset) : undefined}
              style={onSelect ? { cursor: 'pointer' } : undefined}
            >
              <title>{`${a.asset}: ${a.observations} prices${a.firstDate ? `, ${formatDate(a.firstDate)} to ${formatDate(a.lastDate ?? a.firstDate)}` : ''}${a.gaps.length ? `, ${a.gaps.length} gap(s)` : ''}`}</title>
              {isSelected ? <rect x={0} y={y} width={WIDTH} height={ROW} fill={PAPER_DEEP} /> : null}
              <text
                x={LABEL - 8}
                y={y + ROW / 2 + 4}
                fontSize="12"
                textAnchor="end"
                fill={INK}
                fontWeight={isSelected ? 700 : 400}
                fontFamily="DejaVu Sans Mono, monospace"
              >
                {a.asset}
              </text>
              <line
                x1={LABEL}
                x2={WIDTH - RIGHT}
                y1={y + ROW / 2}
                y2={y + ROW / 2}
                stroke={RULE_SOFT}
                strokeWidth="1"
              />
              {runsOf(a).map((r, i) =>
                r.kind === 'prices' ? (
                  <rect
                    key={i}
                    x={x(r.from)}
                    y={y + 5}
                    width={Math.max(1.5, x(r.to) - x(r.from))}
                    height={ROW - 10}
                    fill={isSparse(a) ? SHEET : ACCENT}
                    stroke={ACCENT}
                    strokeWidth={isSparse(a) ? 1.5 : 0}
                  />
                ) : (
                  <rect
                    key={i}
                    x={x(r.from)}
                    y={y + 3}
                    width={Math.max(3, x(r.to) - x(r.from))}
                    height={ROW - 6}
                    fill={`url(#${id}-hatch)`}
                    stroke={AMBER}
                    strokeWidth="1"
                  />
                ),
              )}
              {isSparse(a) && a.lastDate ? (
                <text x={x(a.lastDate) - 4} y={y + ROW / 2 + 3.5} fontSize="9.5" textAnchor="end" fill={ACCENT}>
                  monthly
                </text>
              ) : null}
            </g>
          );
        })}
      </svg>
      <div className="faint" style={{ display: 'flex', gap: '1.4rem', marginTop: '0.3rem' }} aria-hidden="true">
        <span>
          <svg width="22" height="10">
            <rect width="22" height="10" fill={ACCENT} />
          </svg>{' '}
          daily prices
        </span>
        <span>
          <svg width="22" height="10">
            <rect x="0.75" y="0.75" width="20.5" height="8.5" fill={SHEET} stroke={ACCENT} strokeWidth="1.5" />
          </svg>{' '}
          monthly prices
        </span>
        <span>
          <svg width="22" height="10">
            <rect width="22" height="10" fill={`url(#${id}-hatch)`} stroke={AMBER} />
          </svg>{' '}
          gap
        </span>
        <span>
          <svg width="22" height="10">
            <rect width="22" height="10" fill={ACCENT_WASH} />
          </svg>{' '}
          every asset priced
        </span>
      </div>
      <details>
        <summary>The figures behind the picture</summary>
        <DataTable
          rows={coverage.assets}
          rowKey={(a) => a.asset}
          empty="No asset in this universe."
          columns={[
            { key: 'asset', head: 'Asset', className: 'code', sortBy: (a) => a.asset, cell: (a) => a.asset },
            {
              key: 'prices',
              head: 'Prices',
              num: true,
              sortBy: (a) => a.observations,
              cell: (a) => a.observations.toLocaleString(),
            },
            {
              key: 'first',
              head: 'First',
              num: true,
              sortBy: (a) => a.firstDate ?? '',
              cell: (a) => (a.firstDate ? formatDate(a.firstDate) : '\u2013'),
            },
            {
              key: 'last',
              head: 'Last',
              num: true,
              sortBy: (a) => a.lastDate ?? '',
              cell: (a) => (a.lastDate ? formatDate(a.lastDate) : '\u2013'),
            },
            {
              key: 'gaps',
              head: 'Gaps (weekdays without a price)',
              cell: (a) =>
                a.gaps.length === 0
                  ? isSparse(a)
                    ? 'none; priced monthly'
                    : 'none'
                  : a.gaps
                      .map((g) => `${formatDate(g.after)} to ${formatDate(g.before)} (${g.missingWeekdays})`)
                      .join('; '),
            },
          ]}
        />
      </details>
    </figure>
  );
}

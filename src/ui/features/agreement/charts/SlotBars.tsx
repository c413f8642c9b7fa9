import { scaleLinear } from 'd3-scale';
import { useId } from 'react';
import type { SlotFigures } from '../../../../core/agreement';
import { figureText } from '../agreement-format';

const WIDTH = 720;
const ROW = 30;
const LABEL = 130;
const NOTE = 250;
const TOP = 24;

/** Slots by kappa, lowest first (undefined last): the ones needing a look come first. */
export function slotRows(perSlot: Record<string, SlotFigures>): [string, SlotFigures][] {
  return Object.entries(perSlot).sort(([x, a], [y, b]) => (a.kappa.value ?? 2) - (b.kappa.value ?? 2) || (x < y ? -1 : x > y ? 1 : 0));
}

/** Per-slot token kappa (this slot against all else) as bars, with exact-match F1 and span counts beside each. */
export function SlotBars({ perSlot, names }: { perSlot: Record<string, SlotFigures>; names: [string, string] }) {
  const titleId = useId();
  const descId = useId();
  const rows = slotRows(perSlot);
  if (rows.length === 0) return <p>No slot is marked in either layer.</p>;
  const x = scaleLinear().domain([0, 1]).range([LABEL, WIDTH - NOTE]);
  const height = TOP + rows.length * ROW + 8;
  const ticks = [0, 0.2, 0.4, 0.6, 0.8, 1];
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-labelledby={titleId} aria-describedby={descId}>
        <title id={titleId}>Token kappa per slot</title>
        <desc id={descId}>
          {`One bar per slot, lowest kappa first; the figures are in the table below. ${rows.map(([slot, f]) => `${slot}: kappa ${figureText(f.kappa.value)}`).join('; ')}.`}
        </desc>
        {ticks.map((t) => (
          <g key={t}>
            <line x1={x(t)} x2={x(t)} y1={TOP - 4} y2={height - 8} className="chart-grid" />
            <text x={x(t)} y={TOP - 8} textAnchor="middle" className="chart-tick">
              {t.toFixed(1)}
            </text>
          </g>
        ))}
        {rows.map(([slot, f], i) => {
          const y = TOP + i * ROW;
          const value = f.kappa.value;
          const width = value === null ? 0 : Math.max(0, x(Math.min(1, value)) - x(0));
          return (
            <g key={slot}>
              <text x={LABEL - 8} y={y + ROW / 2} textAnchor="end" dominantBaseline="middle" className="chart-label">
                {slot}
              </text>
              <rect x={x(0)} y={y + 5} width={width} height={ROW - 10} className="chart-bar" />
              <text x={WIDTH - NOTE + 8} y={y + ROW / 2} dominantBaseline="middle" className="chart-note">
                {`κ ${figureText(value)} · F1 ${figureText(f.exactF1)} · spans ${f.a} / ${f.b}`}
              </text>
            </g>
          );
        })}
      </svg>
      <figcaption>
        Bars: token kappa of each slot against everything else. Beside each: exact-match span F1 and the spans marked by {names[0]} / {names[1]}.
      </figcaption>
    </figure>
  );
}

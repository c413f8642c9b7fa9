import { useId } from 'react';
import { cividisStops, heatCells, LEGEND_SHARES } from '../heatmap-cells';

const CELL_MAX = 58;
const LEFT = 130;
const TOP = 110;

/** Slot types per token, rows layer A and columns layer B; colour is the share of the row, the number the count. */
export function ConfusionHeatmap({ labels, counts, names }: { labels: string[]; counts: number[][]; names: [string, string] }) {
  const titleId = useId();
  const descId = useId();
  const gradientId = useId();
  const n = labels.length;
  const cell = Math.min(CELL_MAX, Math.floor(560 / Math.max(1, n)));
  const size = cell * n;
  const width = LEFT + size + 100;
  const height = TOP + size + 20;
  const cells = heatCells(counts);
  const stops = cividisStops();
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${width} ${height}`} style={{ maxWidth: `${width}px` }} role="img" aria-labelledby={titleId} aria-describedby={descId}>
        <title id={titleId}>{`Slot types per token: ${names[0]} (rows) against ${names[1]} (columns)`}</title>
        <desc id={descId}>Each cell holds the number of tokens; its colour is that number as a share of the row (lighter is more, on a square-root scale). The same counts are in the table below.</desc>
        <text x={LEFT + size / 2} y={14} textAnchor="middle" className="chart-axis-title">
          {`${names[1]} (columns)`}
        </text>
        <text transform={`translate(14 ${TOP + size / 2}) rotate(-90)`} textAnchor="middle" className="chart-axis-title">
          {`${names[0]} (rows)`}
        </text>
        {labels.map((label, i) => (
          <g key={label}>
            <text x={LEFT - 6} y={TOP + i * cell + cell / 2} textAnchor="end" dominantBaseline="middle" className="chart-label">
              {label}
            </text>
            <text transform={`translate(${LEFT + i * cell + cell / 2} ${TOP - 6}) rotate(-45)`} className="chart-label">
              {label}
            </text>
          </g>
        ))}
        {cells.map((c) => (
          <g key={`${c.row}-${c.column}`}>
            <rect x={LEFT + c.column * cell} y={TOP + c.row * cell} width={cell - 1} height={cell - 1} fill={c.fill}>
              <title>{`${labels[c.row] ?? ''} in ${names[0]}, ${labels[c.column] ?? ''} in ${names[1]}: ${c.count.toLocaleString('en')} tokens (${(100 * c.share).toFixed(1)}% of the row)`}</title>
            </rect>
            <text x={LEFT + c.column * cell + (cell - 1) / 2} y={TOP + c.row * cell + (cell - 1) / 2} textAnchor="middle" dominantBaseline="central" fill={c.text} className="chart-cell">
              {c.label}
            </text>
          </g>
        ))}
        <defs>
          <linearGradient id={gradientId} x1="0" x2="0" y1="1" y2="0">
            {stops.map((s) => (
              <stop key={s.offset} offset={s.offset} stopColor={s.colour} />
            ))}
          </linearGradient>
        </defs>
        <rect x={LEFT + size + 20} y={TOP} width={14} height={size} fill={`url(#${gradientId})`} />
        {LEGEND_SHARES.map((m) => (
          <text key={m.share} x={LEFT + size + 40} y={TOP + size - m.at * size} dominantBaseline="middle" className="chart-tick">
            {m.label}
          </text>
        ))}
        <text transform={`translate(${LEFT + size + 72} ${TOP + size / 2}) rotate(90)`} textAnchor="middle" className="chart-tick">
          share of the row
        </text>
      </svg>
      <figcaption>
        The diagonal is agreement; off the diagonal, which slot type {names[1]} gave the tokens {names[0]} put in the row’s type (O: no slot).
      </figcaption>
    </figure>
  );
}

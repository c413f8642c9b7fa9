import { scaleLinear } from 'd3-scale';
import { useId } from 'react';

const WIDTH = 720;
const ROW = 24;
const LABEL = 150;
const VALUE = 80;

/** Horizontal bars, one per item, with the count written beside each bar. */
export function BarList({ title, items, unit }: { title: string; items: { name: string; value: number }[]; unit: string }) {
  const titleId = useId();
  const descId = useId();
  if (items.length === 0) return <p>Nothing to show yet.</p>;
  const max = Math.max(1, ...items.map((i) => i.value));
  const x = scaleLinear().domain([0, max]).range([0, WIDTH - LABEL - VALUE]);
  const height = items.length * ROW + 4;
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-labelledby={titleId} aria-describedby={descId}>
        <title id={titleId}>{title}</title>
        <desc id={descId}>{items.map((i) => `${i.name}: ${i.value.toLocaleString('en')} ${unit}`).join('; ')}</desc>
        {items.map((item, i) => (
          <g key={item.name}>
            <text x={LABEL - 8} y={i * ROW + ROW / 2} textAnchor="end" dominantBaseline="middle" className="chart-label">
              {item.name}
            </text>
            <rect x={LABEL} y={i * ROW + 4} width={Math.max(item.value > 0 ? 1 : 0, x(item.value))} height={ROW - 8} className="chart-bar" />
            <text x={LABEL + x(item.value) + 6} y={i * ROW + ROW / 2} dominantBaseline="middle" className="chart-note">
              {item.value.toLocaleString('en')}
            </text>
          </g>
        ))}
      </svg>
    </figure>
  );
}

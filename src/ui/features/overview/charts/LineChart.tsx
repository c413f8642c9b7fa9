import { scaleLinear, scaleUtc } from 'd3-scale';
import { useId } from 'react';
import { seriesColour } from './chart-colours';

const WIDTH = 720;
const HEIGHT = 240;
const LEFT = 64;
const RIGHT = 110;
const TOP = 16;
const BOTTOM = 40;
const DAY = 86_400_000;

export interface Series {
  name: string;
  points: { time: number; value: number }[];
}

const day = (t: number) => new Date(t).toISOString().slice(0, 10);

/** The points are whole UTC days: ticks between two midnights would repeat a day's label. */
function dayTicks(ticks: Date[]): Date[] {
  return ticks.filter((t) => t.getUTCHours() === 0 && t.getUTCMinutes() === 0);
}

/** Step lines of running totals over UTC days, each labelled at its end with its name and last value. */
export function LineChart({ title, series, yTitle }: { title: string; series: Series[]; yTitle: string }) {
  const titleId = useId();
  const descId = useId();
  const all = series.flatMap((s) => s.points);
  if (all.length === 0) return <p>Nothing to show yet.</p>;
  const times = all.map((p) => p.time);
  let low = Math.min(...times);
  let high = Math.max(...times);
  // A single day: widen so the points sit inside the axis.
  if (low === high) {
    low -= DAY;
    high += DAY;
  }
  const x = scaleUtc().domain([low, high]).range([LEFT, WIDTH - RIGHT]);
  const y = scaleLinear()
    .domain([0, Math.max(1, ...all.map((p) => p.value))])
    .nice()
    .range([HEIGHT - BOTTOM, TOP]);
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-labelledby={titleId} aria-describedby={descId}>
        <title id={titleId}>{title}</title>
        <desc id={descId}>{series.map((s) => `${s.name}: ${s.points.map((p) => `${day(p.time)} ${p.value}`).join(', ')}`).join('; ')}</desc>
        {y.ticks(5).map((t) => (
          <g key={t}>
            <line x1={LEFT} x2={WIDTH - RIGHT} y1={y(t)} y2={y(t)} className="chart-grid" />
            <text x={LEFT - 8} y={y(t)} textAnchor="end" dominantBaseline="middle" className="chart-tick">
              {t.toLocaleString('en')}
            </text>
          </g>
        ))}
        {dayTicks(x.ticks(5)).map((t) => (
          <text key={t.getTime()} x={x(t)} y={HEIGHT - BOTTOM + 18} textAnchor="middle" className="chart-tick">
            {day(t.getTime())}
          </text>
        ))}
        <text transform={`translate(14 ${(HEIGHT - BOTTOM + TOP) / 2}) rotate(-90)`} textAnchor="middle" className="chart-axis-title">
          {yTitle}
        </text>
        {series.map((s, i) => {
          const colour = seriesColour(i);
          // A running total holds until the next day with a change: a step line says that.
          const d = s.points.map((p, k) => `${k === 0 ? 'M' : `H${x(p.time).toFixed(1)} V`}${k === 0 ? `${x(p.time).toFixed(1)},` : ''}${y(p.value).toFixed(1)}`).join(' ');
          const last = s.points[s.points.length - 1];
          return (
            <g key={s.name}>
              <path d={d} fill="none" stroke={colour} strokeWidth={2} />
              {s.points.map((p) => (
                <circle key={p.time} cx={x(p.time)} cy={y(p.value)} r={3} fill={colour}>
                  <title>{`${s.name}, ${day(p.time)}: ${p.value.toLocaleString('en')}`}</title>
                </circle>
              ))}
              {last !== undefined && (
                <text x={x(last.time) + 8} y={y(last.value) + i * 13} dominantBaseline="middle" className="chart-label">
                  {`${s.name} ${last.value.toLocaleString('en')}`}
                </text>
              )}
            </g>
          );
        })}
      </svg>
    </figure>
  );
}

import { scaleLinear, scaleUtc } from 'd3-scale';
import { useId } from 'react';
import type { TimePoint } from '../../../../workers/agreement-time';
import { dayText, figureText, timeTickText } from '../agreement-format';

const WIDTH = 720;
const HEIGHT = 240;
const LEFT = 56;
const RIGHT = 24;
const TOP = 16;
const BOTTOM = 40;
const DAY = 86_400_000;

/** Slot kappa over the utterances both layers had completed by each moment. */
export function TimeChart({ points }: { points: TimePoint[] }) {
  const titleId = useId();
  const descId = useId();
  const defined = points.filter((p): p is TimePoint & { kappa: number } => p.kappa !== null);
  if (defined.length === 0) return <p>No moment yet where the slot kappa is defined.</p>;
  const first = defined[0] as TimePoint;
  const last = defined[defined.length - 1] as TimePoint;
  // One moment only: a day either side, so the point sits in the middle.
  const span: [number, number] = first.time === last.time ? [first.time - DAY, last.time + DAY] : [first.time, last.time];
  const x = scaleUtc().domain(span).range([LEFT, WIDTH - RIGHT]);
  const low = Math.min(...defined.map((p) => p.kappa));
  const y = scaleLinear()
    .domain([Math.max(-1, Math.min(0.5, Math.floor(low * 10) / 10 - 0.1)), 1])
    .range([HEIGHT - BOTTOM, TOP]);
  const path = defined.map((p, i) => `${i === 0 ? 'M' : 'L'}${x(p.time).toFixed(1)},${y(p.kappa).toFixed(1)}`).join(' ');
  const xTicks = x.ticks(5);
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-labelledby={titleId} aria-describedby={descId}>
        <title id={titleId}>Slot kappa as layers were completed</title>
        <desc id={descId}>
          {`${defined.length} moments from ${dayText(first.time)} to ${dayText(last.time)}; kappa went from ${figureText(first.kappa)} over ${first.utterances} utterances to ${figureText(last.kappa)} over ${last.utterances}. The points are in the table below.`}
        </desc>
        {y.ticks(5).map((t) => (
          <g key={t}>
            <line x1={LEFT} x2={WIDTH - RIGHT} y1={y(t)} y2={y(t)} className="chart-grid" />
            <text x={LEFT - 8} y={y(t)} textAnchor="end" dominantBaseline="middle" className="chart-tick">
              {t.toFixed(1)}
            </text>
          </g>
        ))}
        {xTicks.map((t) => (
          <text key={t.getTime()} x={x(t)} y={HEIGHT - BOTTOM + 18} textAnchor="middle" className="chart-tick">
            {timeTickText(t.getTime(), span[1] - span[0])}
          </text>
        ))}
        <text transform={`translate(14 ${(HEIGHT - BOTTOM + TOP) / 2}) rotate(-90)`} textAnchor="middle" className="chart-axis-title">
          slot kappa
        </text>
        <text x={(LEFT + WIDTH - RIGHT) / 2} y={HEIGHT - 4} textAnchor="middle" className="chart-axis-title">
          when the later of the two layers was completed (UTC)
        </text>
        <path d={path} className="chart-line" />
        {defined.map((p) => (
          <circle key={p.time} cx={x(p.time)} cy={y(p.kappa)} r={4} className="chart-point">
            <title>{`${dayText(p.time)}: kappa ${figureText(p.kappa)} over ${p.utterances} utterances`}</title>
          </circle>
        ))}
      </svg>
      <figcaption>Each point: the slot kappa over every utterance whose two layers were both complete by then.</figcaption>
    </figure>
  );
}

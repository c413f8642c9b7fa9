import { scaleLinear } from 'd3-scale';
import { useId } from 'react';
import { LAYER_STATUSES, type LayerStatus } from '../../../../core/backup/model';
import { STATUS_COLOURS, textOn } from './chart-colours';

const WIDTH = 720;
const ROW = 30;
const LABEL = 120;
const LEGEND = 28;

export interface StatusRow {
  name: string;
  statuses: Record<LayerStatus, number>;
}

/** One stacked bar per annotator: layers by status, each segment labelled with its count where it fits. */
export function StatusBars({ rows }: { rows: StatusRow[] }) {
  const titleId = useId();
  const descId = useId();
  if (rows.length === 0) return <p>No layers yet.</p>;
  const max = Math.max(1, ...rows.map((r) => LAYER_STATUSES.reduce((sum, s) => sum + r.statuses[s], 0)));
  const x = scaleLinear().domain([0, max]).range([0, WIDTH - LABEL - 10]);
  const height = LEGEND + rows.length * ROW + 4;
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-labelledby={titleId} aria-describedby={descId}>
        <title id={titleId}>Layers per annotator by status</title>
        <desc id={descId}>{rows.map((r) => `${r.name}: ${LAYER_STATUSES.map((s) => `${r.statuses[s]} ${s}`).join(', ')}`).join('; ')}</desc>
        {LAYER_STATUSES.map((s, i) => (
          <g key={s} transform={`translate(${LABEL + i * 110} 4)`}>
            <rect width={14} height={14} fill={STATUS_COLOURS[s]} stroke="#1b2830" strokeWidth={0.5} />
            <text x={20} y={11} className="chart-label">
              {s}
            </text>
          </g>
        ))}
        {rows.map((r, i) => {
          let at = LABEL;
          const y = LEGEND + i * ROW;
          return (
            <g key={r.name}>
              <text x={LABEL - 8} y={y + ROW / 2} textAnchor="end" dominantBaseline="middle" className="chart-label">
                {r.name}
              </text>
              {LAYER_STATUSES.map((s) => {
                const n = r.statuses[s];
                if (n === 0) return null;
                const w = x(n);
                const from = at;
                at += w;
                return (
                  <g key={s}>
                    <rect x={from} y={y + 3} width={w} height={ROW - 6} fill={STATUS_COLOURS[s]}>
                      <title>{`${r.name}: ${n.toLocaleString('en')} ${s}`}</title>
                    </rect>
                    {w > 40 && (
                      <text x={from + w / 2} y={y + ROW / 2} textAnchor="middle" dominantBaseline="central" fill={textOn(STATUS_COLOURS[s])} className="chart-cell">
                        {n.toLocaleString('en')}
                      </text>
                    )}
                  </g>
                );
              })}
            </g>
          );
        })}
      </svg>
    </figure>
  );
}

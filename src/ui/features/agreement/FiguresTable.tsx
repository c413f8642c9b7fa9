import { LANDIS_KOCH_CAUTION, type AgreementReport, type Interval, type KappaFigure } from '../../../core/agreement';
import { countText, figureText, intervalText, kappaBand } from './agreement-format';

interface Row {
  key: string;
  name: string;
  what: string;
  value: number | null;
  reason?: string | undefined;
  interval: Interval | null;
  /** Kappas get the Landis & Koch reading; F1 scores do not. */
  band: string | null;
  compared: string;
}

function kappaRow(key: string, name: string, what: string, figure: KappaFigure, interval: Interval | null, unit: string): Row {
  return { key, name, what, value: figure.value, reason: figure.reason, interval, band: kappaBand(figure), compared: `${countText(figure.n)} ${unit}` };
}

export function figureRows(report: AgreementReport): Row[] {
  const { kappa, intent, spans, ci } = report;
  const rows: Row[] = [
    kappaRow('kappa-tag', 'Token kappa, tags', 'each token’s full tag (B- and I- apart)', kappa.tag, ci?.kappaTag ?? null, 'tokens'),
    kappaRow('kappa-slot', 'Token kappa, slot types', 'each token’s slot type (O or a slot)', kappa.slot, ci?.kappaSlot ?? null, 'tokens'),
    kappaRow('kappa-annotated', 'Token kappa, annotated tokens only', 'slot types on tokens that either layer put in a slot', kappa.slotAnnotated, ci?.kappaSlotAnnotated ?? null, 'tokens'),
  ];
  if (intent !== null) rows.push(kappaRow('kappa-intent', 'Intent kappa', 'each utterance’s intent', intent.kappa, ci?.intentKappa ?? null, 'utterances'));
  const spansCompared = `${countText(spans.a)} / ${countText(spans.b)} spans`;
  rows.push(
    { key: 'span-exact', name: 'Span F1, exact', what: 'spans with the same slot, start and end', value: spans.exactF1, reason: spans.reason, interval: ci?.exactF1 ?? null, band: null, compared: spansCompared },
    { key: 'span-overlap', name: 'Span F1, overlap', what: 'spans with the same slot that share a token', value: spans.overlapF1, reason: spans.reason, interval: ci?.overlapF1 ?? null, band: null, compared: spansCompared },
  );
  return rows;
}

/** Every two-layer figure with its interval and, for kappas, the reading aid. */
export function FiguresTable({ report, intervalsPending = false }: { report: AgreementReport; intervalsPending?: boolean }) {
  const rows = figureRows(report);
  const ci = report.ci;
  return (
    <>
      <table className="agreement-figures">
        <caption>
          {report.pairNames[0]} against {report.pairNames[1]}
        </caption>
        <thead>
          <tr>
            <th scope="col">Figure</th>
            <th scope="col">Value</th>
            <th scope="col">{ci === null ? (intervalsPending ? '95% interval' : 'Interval') : `${Math.round(ci.confidence * 100)}% interval`}</th>
            <th scope="col">Reading (Landis &amp; Koch)</th>
            <th scope="col">Compared</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key}>
              <th scope="row">
                {r.name}
                <span className="agreement-what">{r.what}</span>
              </th>
              <td data-testid={`figure-${r.key}`} className="agreement-value">
                {figureText(r.value)}
                {r.value === null && r.reason !== undefined && <span className="agreement-what">{r.reason}</span>}
              </td>
              <td>{intervalsPending ? 'computing…' : intervalText(r.interval)}</td>
              <td>{r.band ?? (r.key.startsWith('span') ? 'not a kappa' : '—')}</td>
              <td>{r.compared}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="agreement-note">
        {ci === null
          ? intervalsPending
            ? 'Intervals: bootstrap resamples are being drawn (progress above).'
            : 'No intervals were computed.'
          : `Intervals: ${ci.method} bootstrap over ${countText(ci.resamples)} resamples of whole utterances (seed ${ci.seed}), as the command line’s agree computes them.`}{' '}
        <strong>Caution:</strong> {LANDIS_KOCH_CAUTION}
      </p>
    </>
  );
}

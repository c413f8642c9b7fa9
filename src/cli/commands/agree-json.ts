import { landisKoch, type AgreementReport, type Interval, type KappaFigure } from '../../core/agreement';

/** A figure's number, and its reason recorded under `path` when it is undefined. */
function figure(value: number | null, reason: string | undefined, path: string, reasons: Record<string, string>): number | null {
  if (value === null && reason !== undefined) reasons[path] = reason;
  return value;
}

function interval(i: Interval | null): { low: number | null; high: number | null; resamples: number } | null {
  return i === null ? null : { low: i.low, high: i.high, resamples: i.resamples };
}

/**
 * The `agree --json` document: headline figures are plain numbers (null when undefined, with the
 * reason under `reasons`), full detail (observed/expected agreement, counts) under `details`.
 */
export function agreeJson(report: AgreementReport): Record<string, unknown> {
  const reasons: Record<string, string> = {};
  const k = (f: KappaFigure, path: string) => figure(f.value, f.reason, path, reasons);
  const perSlot: Record<string, unknown> = {};
  for (const [slot, s] of Object.entries(report.perSlot)) {
    perSlot[slot] = { kappa: k(s.kappa, `perSlot.${slot}.kappa`), exactF1: s.exactF1, a: s.a, b: s.b, exactMatched: s.exactMatched };
  }
  const slotKappa = report.kappa.slot.value;
  const out: Record<string, unknown> = {
    layers: report.layers,
    pair: report.pairNames,
    utterances: report.utterances,
    tokens: report.tokens,
    kappa: {
      tag: k(report.kappa.tag, 'kappa.tag'),
      slot: k(report.kappa.slot, 'kappa.slot'),
      slotAnnotated: k(report.kappa.slotAnnotated, 'kappa.slotAnnotated'),
    },
    intent: report.intent === null ? null : { kappa: k(report.intent.kappa, 'intent.kappa'), n: report.intent.n },
    spans: {
      exactF1: figure(report.spans.exactF1, report.spans.reason, 'spans.exactF1', reasons),
      overlapF1: figure(report.spans.overlapF1, report.spans.reason, 'spans.overlapF1', reasons),
      a: report.spans.a,
      b: report.spans.b,
      exactMatched: report.spans.exactMatched,
      overlapMatched: report.spans.overlapMatched,
      matching: report.spans.matching,
    },
    perSlot,
    ci:
      report.ci === null
        ? null
        : {
            confidence: report.ci.confidence,
            resamples: report.ci.resamples,
            seed: report.ci.seed,
            method: report.ci.method,
            unit: report.ci.unit,
            kappa: { tag: interval(report.ci.kappaTag), slot: interval(report.ci.kappaSlot), slotAnnotated: interval(report.ci.kappaSlotAnnotated) },
            intent: report.ci.intentKappa === null ? null : { kappa: interval(report.ci.intentKappa) },
            spans: { exactF1: interval(report.ci.exactF1), overlapF1: interval(report.ci.overlapF1) },
          },
    reading: slotKappa === null ? null : { slotKappa: landisKoch(slotKappa) },
    confusion: report.confusion,
    disagreements: report.disagreements,
    details: { kappa: report.kappa, intent: report.intent },
  };
  if (report.fleissKappa !== undefined) out.fleissKappa = { slot: k(report.fleissKappa.slot, 'fleissKappa.slot') };
  if (report.alpha !== undefined) out.alpha = { slot: figure(report.alpha.slot.value, report.alpha.slot.reason, 'alpha.slot', reasons) };
  if (report.pairwise !== undefined) out.pairwise = report.pairwise;
  if (report.fleissKappa !== undefined || report.alpha !== undefined) {
    (out.details as Record<string, unknown>).fleissKappa = report.fleissKappa;
    (out.details as Record<string, unknown>).alpha = report.alpha;
  }
  out.reasons = reasons;
  return out;
}

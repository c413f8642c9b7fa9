import { LANDIS_KOCH_CAUTION, landisKoch, type AgreementReport, type Interval, type KappaFigure } from '../../core/agreement';

function num(value: number | null, digits = 3): string {
  return value === null ? 'n/a' : value.toFixed(digits);
}

function ci(i: Interval | null | undefined): string {
  if (i === null || i === undefined || i.low === null || i.high === null) return '';
  return `[${num(i.low)}, ${num(i.high)}]`;
}

function kappaCell(f: KappaFigure): string {
  if (f.value === null) return `n/a (${f.reason ?? 'undefined'})`;
  return `${num(f.value)}  ${landisKoch(f.value).band}`;
}

/** The readable `agree` report: headline table, per-slot table, top disagreements. */
export function agreeText(report: AgreementReport, limit = 10): string {
  const lines: string[] = [];
  const [a, b] = report.pairNames;
  lines.push(`A = ${a}`, `B = ${b}`, `${report.utterances} shared utterances, ${report.tokens} tokens`, '');
  const interval = report.ci;
  const pct = interval === null ? '' : `${Math.round(interval.confidence * 100)}% CI (${interval.resamples} resamples by utterance)`;
  const rows: [string, string, string][] = [
    ['figure', 'value', pct],
    ["Cohen's kappa, tags", kappaCell(report.kappa.tag), ci(interval?.kappaTag)],
    ["Cohen's kappa, slot types", kappaCell(report.kappa.slot), ci(interval?.kappaSlot)],
    ["Cohen's kappa, slot types where marked", kappaCell(report.kappa.slotAnnotated), ci(interval?.kappaSlotAnnotated)],
    ["Cohen's kappa, intents", report.intent === null ? 'n/a (no intents)' : kappaCell(report.intent.kappa), ci(interval?.intentKappa)],
    ['span F1, exact match', num(report.spans.exactF1), ci(interval?.exactF1)],
    ['span F1, overlap match', num(report.spans.overlapF1), ci(interval?.overlapF1)],
  ];
  if (report.fleissKappa !== undefined) rows.push(["Fleiss' kappa, slot types (all layers)", kappaCell(report.fleissKappa.slot), '']);
  if (report.alpha !== undefined) rows.push(["Krippendorff's alpha, slot types (nominal)", num(report.alpha.slot.value), '']);
  const w0 = Math.max(...rows.map((r) => r[0].length));
  const w1 = Math.max(...rows.map((r) => r[1].length));
  for (const [x, y, z] of rows) lines.push(`${x.padEnd(w0)}  ${y.padEnd(w1)}  ${z}`.trimEnd());
  lines.push('', `Bands: ${LANDIS_KOCH_CAUTION}`, '');

  const slots = Object.entries(report.perSlot);
  if (slots.length > 0) {
    const ws = Math.max(4, ...slots.map(([s]) => s.length));
    lines.push(`${'slot'.padEnd(ws)}  kappa   exactF1  spans A  spans B`);
    for (const [slot, f] of slots) {
      lines.push(`${slot.padEnd(ws)}  ${num(f.kappa.value).padStart(5)}  ${num(f.exactF1).padStart(8)}  ${String(f.a).padStart(7)}  ${String(f.b).padStart(7)}`);
    }
    lines.push('');
  }
  if (report.pairwise !== undefined) {
    lines.push("pairwise Cohen's kappa, slot types:");
    report.pairwise.layers.forEach((name, i) => lines.push(`  ${name}: ${(report.pairwise?.kappa[i] ?? []).map((v) => num(v)).join('  ')}`));
    lines.push('');
  }
  const items = report.disagreements.items.slice(0, limit);
  if (items.length > 0) {
    lines.push(`most differing utterances (${report.disagreements.total} differ in all):`);
    for (const d of items) {
      const where = d.line === undefined ? '' : ` (A line ${d.line}${d.lineB === undefined ? '' : `, B line ${d.lineB}`})`;
      lines.push(`  ${d.id ?? `#${d.index + 1}`}${where}: ${d.tokensDiffering} token(s)${d.intentDiffers ? ', intent' : ''}`);
    }
  }
  return `${lines.join('\n')}\n`;
}

/** The rule review's plain logic: finding rows, filters, layer keys and the repair preview. */
import { layerTagsRepair, tagsChangedAt, tokensAround, type ContextToken } from '../../../core/adjudication';
import { ruleDescribe, type RepairStrategy } from '../../../core/rules';
import { spansFromTags } from '../../../core/schemes';
import type { RepairTarget, RuleFinding, RuleLayer, RulesScan } from '../../../db/rules-repo';

export interface FindingRow {
  /** Stable within one scan: layer key and finding position. */
  id: string;
  layerKey: string;
  layer: RuleLayer;
  finding: RuleFinding;
  /** The rule in plain words. */
  rule: string;
  context: ContextToken[];
  /** Token indices to mark: the two sides of an illegal transition, or the whole span at fault. */
  marked: number[];
  /** Whether a repair can change it (intent findings cannot; schema ones only with the schema option). */
  repairable: 'always' | 'schema-option' | 'never';
}

export type FindingKind = 'all' | 'transition' | 'schema';

export interface FindingFilter {
  kind: FindingKind;
  /** Layer owner, or '' for every owner. */
  owner: string;
}

export function layerKeyOf(layer: { utteranceId: number; annotator: string }): string {
  return `${layer.utteranceId}\u0000${layer.annotator}`;
}

function markedOf(layer: RuleLayer, finding: RuleFinding): number[] {
  const at = finding.index;
  if (at === null) return [];
  if (finding.kind === 'schema') {
    const span = spansFromTags(layer.tags).find((s) => s.start === at);
    return span === undefined ? [at] : Array.from({ length: span.end - span.start }, (_, i) => span.start + i);
  }
  // The transition into the utterance end points at the last token alone; others at both of its tokens.
  return at === 0 || finding.rule === 'bioes/unclosed-at-end' ? [at] : [at - 1, at];
}

/** The context of a finding: a few tokens either side of everything marked. */
function contextOf(layer: RuleLayer, marked: readonly number[], index: number): ContextToken[] {
  const first = marked[0] ?? index;
  const last = marked[marked.length - 1] ?? index;
  const middle = Math.floor((first + last) / 2);
  return tokensAround(layer.words, layer.tags, index, 3 + Math.max(0, last - first)).filter((t) => Math.abs(t.index - middle) <= 3 + Math.ceil((last - first) / 2));
}

export function findingRows(scan: RulesScan): FindingRow[] {
  return scan.layers.flatMap((layer) =>
    layer.findings.map((finding, i): FindingRow => {
      const marked = markedOf(layer, finding);
      return {
        id: `${layerKeyOf(layer)}\u0000${i}`,
        layerKey: layerKeyOf(layer),
        layer,
        finding,
        rule: ruleDescribe(finding.rule),
        context: finding.index === null ? [] : contextOf(layer, marked, finding.index),
        marked,
        repairable: finding.kind === 'transition' ? 'always' : finding.index === null ? 'never' : 'schema-option',
      };
    }),
  );
}

export function findingsFilter(rows: readonly FindingRow[], filter: FindingFilter): FindingRow[] {
  return rows.filter((r) => (filter.kind === 'all' || r.finding.kind === filter.kind) && (filter.owner === '' || r.layer.annotator === filter.owner));
}

export interface RepairOptionsChosen {
  strategy: RepairStrategy;
  /** Also drop spans the schema does not allow. */
  schemaSpans: boolean;
}

export interface PreviewLayer {
  layer: RuleLayer;
  after: string[];
  changedAt: number[];
}

export interface RepairPreviewResult {
  layers: PreviewLayer[];
  tagsChanged: number;
  /** Chosen layers a repair leaves as they are (e.g. only an unknown intent). */
  unchanged: number;
}

/** What the repair would do to the chosen layers: the same function the repository applies. */
export function repairPreviewOf(scan: RulesScan, keys: ReadonlySet<string>, options: RepairOptionsChosen): RepairPreviewResult {
  const result: RepairPreviewResult = { layers: [], tagsChanged: 0, unchanged: 0 };
  for (const layer of scan.layers) {
    if (!keys.has(layerKeyOf(layer))) continue;
    const after = layerTagsRepair(layer.tags, layer.intent, scan.scheme, { strategy: options.strategy, schema: options.schemaSpans ? scan.schema : null });
    const changedAt = tagsChangedAt(layer.tags, after);
    if (changedAt.length === 0) result.unchanged++;
    else {
      result.layers.push({ layer, after, changedAt });
      result.tagsChanged += changedAt.length;
    }
  }
  return result;
}

export function repairTargets(preview: RepairPreviewResult): RepairTarget[] {
  return preview.layers.map(({ layer }) => ({ utteranceId: layer.utteranceId, annotator: layer.annotator, revision: layer.revision }));
}

/** A finding list's identity for comparing two scans: where and which rule, not revisions. */
export function findingsSignature(scan: RulesScan): string[] {
  return scan.layers.flatMap((l) => l.findings.map((f) => `${l.seq}|${l.annotator}|${f.rule}|${f.index ?? '-'}`));
}

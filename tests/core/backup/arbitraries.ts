/**
 * Random projects as backup models, for the codec and the database round trips: texts with emoji,
 * combining marks, Hebrew/Arabic and CJK (from the shared format generators), tags drawn from a pool
 * with illegal sequences and malformed tags on purpose, optional fields present or absent.
 */
import fc from 'fast-check';
import type {
  AnnotatorInfo,
  BackupData,
  BackupDismissal,
  BackupExchange,
  BackupModel,
  BackupHistory,
  BackupLayer,
  BackupUtterance,
  BatchInfo,
  IntentDef,
  LayerContent,
  ProjectInfo,
  SlotDef,
} from '../../../src/core/backup/model';
import { CRF_FEATURE_SET, crfModelToJson, type CrfModel, type CrossValidation, type SpanEvaluation, type SpanFigures } from '../../../src/core/crf';
import { findingKey } from '../../../src/core/error-detect';
import { fieldValueArbitrary, INTENTS, metaKeyArbitrary, shapeArbitrary, SLOTS } from '../../generators/formats';

/** Legal and illegal IOB2/BIOES tags, and strings no scheme accepts: imports keep them all. */
export const TAG_POOL = ['O', 'B-day', 'I-day', 'I-service', 'B-area', 'E-area', 'S-budget', 'B-día', 'I-地区', 'B-', 'x', 'i-day', ''];

const time = fc.integer({ min: 0, max: 4_102_444_800_000 });
const text = fc.oneof(fieldValueArbitrary, fc.constantFrom('Boiler jobs', 'תיקונים', 'إصلاحات 🔧', '修理 / 水道', '', 'a\u0301'));
const optional = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });

/** Drop keys whose value is undefined, as the codec never writes them. */
function defined<T>(value: object): T {
  return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as T;
}

const projectArbitrary: fc.Arbitrary<ProjectInfo> = fc.record({
  name: text,
  created: time,
  updated: time,
  tokeniser: fc.oneof(
    fc.constant({ kind: 'words' as const }),
    fc.constant({ kind: 'whitespace' as const }),
    fc.record({ kind: fc.constant('regex' as const), pattern: fc.constantFrom('\\S+', '[\\p{L}\\p{N}]+'), flags: optional(fc.constantFrom('u', 'gu')) }).map((t) => defined<ProjectInfo['tokeniser']>(t)),
  ),
  scheme: fc.constantFrom('iob1' as const, 'iob2' as const, 'bioes' as const),
  schema: fc.record({
    slots: fc.uniqueArray(
      fc.record({
        name: fc.constantFrom(...SLOTS),
        key: optional(fc.constantFrom('s', 'p', '1', 'ä')),
        colour: optional(fc.constantFrom('#2a6f97', '#c1121f')),
        description: optional(text),
        examples: optional(fc.array(text, { maxLength: 2 })),
        intents: optional(fc.array(fc.constantFrom(...INTENTS), { maxLength: 2 })),
      }).map((slot) => defined<SlotDef>(slot)),
      { maxLength: 3, selector: (s) => s.name },
    ),
    intents: fc.uniqueArray(fc.record({ name: fc.constantFrom(...INTENTS), description: optional(text) }).map((i) => defined<IntentDef>(i)), { maxLength: 3, selector: (i) => i.name }),
  }),
});

const annotatorsArbitrary: fc.Arbitrary<AnnotatorInfo[]> = fc.uniqueArray(
  fc.record({ id: fc.constantFrom('ana', 'bo', 'cy', 'דנה', '李'), name: text, role: fc.constantFrom('annotator' as const, 'adjudicator' as const) }),
  { maxLength: 3, selector: (a) => a.id },
);

const batchArbitrary: fc.Arbitrary<BatchInfo> = fc
  .record({
    fileName: fc.constantFrom('visits.iob', 'ברז.jsonl', 'calls 2025.csv'),
    format: fc.constantFrom('columns', 'jsonl', 'csv', 'text'),
    annotator: optional(fc.constantFrom('ana', 'gold')),
    layerStatus: optional(fc.constantFrom('done' as const, 'draft' as const)),
    counts: fc.record({ utterances: fc.nat(9), tokens: fc.nat(99), layers: fc.nat(9) }),
    attached: optional(fc.nat(9)),
    warnings: fc.array(fc.record({ line: fc.nat(500), message: text }), { maxLength: 2 }),
    state: fc.constantFrom('done' as const, 'failed' as const, 'cancelled' as const),
    created: time,
    finished: optional(time),
    failure: optional(text),
  })
  .map((b) => defined<BatchInfo>(b));

function contentArbitrary(tokenCount: number): fc.Arbitrary<LayerContent> {
  return fc.record({
    tags: fc.array(fc.constantFrom(...TAG_POOL), { minLength: tokenCount, maxLength: tokenCount }),
    intent: fc.option(fc.constantFrom(...INTENTS, 'unknown intent', ''), { nil: null }),
    status: fc.constantFrom('unlabelled' as const, 'draft' as const, 'done' as const, 'skipped' as const, 'flagged' as const),
    note: fc.oneof(fc.constant(''), text),
    revision: fc.integer({ min: 1, max: 40 }),
    updated: time,
  });
}

function utterancesArbitrary(batchCount: number): fc.Arbitrary<BackupUtterance[]> {
  const one = fc.record({
    shape: shapeArbitrary,
    externalId: optional(fieldValueArbitrary),
    intentHint: optional(fc.constantFrom(...INTENTS)),
    meta: fc.dictionary(metaKeyArbitrary, fieldValueArbitrary, { maxKeys: 2 }),
    batch: batchCount === 0 ? fc.constant(undefined) : optional(fc.integer({ min: 1, max: batchCount })),
    line: optional(fc.integer({ min: 1, max: 10_000 })),
    gap: fc.integer({ min: 1, max: 3 }),
  });
  return fc.array(one, { maxLength: 6 }).map((list) => {
    let seq = 0;
    return list.map(({ shape, gap, ...rest }) => {
      seq += gap;
      return defined<BackupUtterance>({ seq, text: shape.text, tokens: shape.tokens.flatMap((t) => [t.start, t.end]), ...rest });
    });
  });
}

const hex = (length: number) => fc.string({ unit: fc.constantFrom(...'0123456789abcdef'), minLength: length, maxLength: length });

export const exchangeArbitrary: fc.Arbitrary<BackupExchange> = fc
  .record({
    uid: hex(32),
    role: fc.constantFrom('master' as const, 'copy' as const),
    name: optional(text),
    packs: fc.array(fc.record({ id: hex(64), annotator: fc.constantFrom('ana', 'bo', 'דנה'), created: time, seqs: fc.array(fc.integer({ min: 1, max: 99 }), { maxLength: 4 }) }), { maxLength: 3 }),
  })
  .map((e) => defined<BackupExchange>(e));

/** A small model whose tables fit together, so the model-file reader accepts it; weights any float64. */
export const crfModelArbitrary: fc.Arbitrary<CrfModel> = fc
  .record({
    labels: fc.uniqueArray(fc.constantFrom('O', 'B-day', 'I-day', 'B-service', 'B-地区'), { minLength: 1, maxLength: 3 }),
    attributes: fc.uniqueArray(fc.constantFrom('w[0]=tap', 'w[-1]=on', 'shape=Xx', 'w[1]=פרידי'), { maxLength: 3 }),
    loss: fc.double({ min: 0, max: 1e6, noNaN: true }),
    iterations: fc.nat(200),
  })
  .chain(({ labels, attributes, loss, iterations }) =>
    fc.tuple(fc.array(fc.subarray(labels.map((_, i) => i), { minLength: 1 }), { minLength: attributes.length, maxLength: attributes.length })).chain(([perAttribute]) => {
      const featureLabels = perAttribute.flat();
      const starts = [0];
      for (const list of perAttribute) starts.push((starts.at(-1) as number) + list.length);
      const weightCount = featureLabels.length + labels.length * labels.length;
      return fc.array(fc.double(), { minLength: weightCount, maxLength: weightCount }).map(
        (weights): CrfModel => ({
          labels,
          attributes,
          featureStarts: Int32Array.from(starts),
          featureLabels: Uint16Array.from(featureLabels),
          weights: Float64Array.from(weights),
          training: { featureSet: CRF_FEATURE_SET, c2: 1, seed: 7, maxIterations: 200, iterations, loss, stopped: 'converged', utterances: 12, tokens: 60, evaluations: iterations + 3 },
        }),
      );
    }),
  );

const count = fc.nat(500);
const share = fc.double({ min: 0, max: 1, noNaN: true }).map((x) => x + 0);
const figuresArbitrary: fc.Arbitrary<SpanFigures> = fc.record({ truePositives: count, falsePositives: count, falseNegatives: count, precision: share, recall: share, f1: share });
const evaluationArbitrary: fc.Arbitrary<SpanEvaluation> = fc.record({
  slots: fc.dictionary(fc.constantFrom(...SLOTS, '12', 'x y'), figuresArbitrary, { maxKeys: 3 }),
  overall: figuresArbitrary,
  utterances: count,
  exactUtterances: count,
});
const crossValidationArbitrary: fc.Arbitrary<CrossValidation> = fc
  .integer({ min: 2, max: 3 })
  .chain((folds) => fc.record({ folds: fc.constant(folds), pooled: evaluationArbitrary, perFold: fc.array(evaluationArbitrary, { minLength: folds, maxLength: folds }) }));

/** Trained models carry cross-validation or not; loaded files may be laid out by hand (indented): kept as text. */
export const storedModelArbitrary: fc.Arbitrary<BackupModel> = fc.record({
  json: fc.tuple(crfModelArbitrary, fc.boolean()).map(([model, indented]) => (indented ? JSON.stringify(JSON.parse(crfModelToJson(model)), null, 2) : crfModelToJson(model))),
  saved: time,
  origin: fc.constantFrom('trained' as const, 'file' as const),
  crossValidation: fc.option(crossValidationArbitrary, { nil: null }),
});

const dismissalArbitrary: fc.Arbitrary<BackupDismissal> = fc.record({ when: time, who: fc.option(fc.constantFrom('ana', 'bo', '李'), { nil: null }) });

/**
 * Dismissals keyed as the core builds finding keys: content-only kinds, and model disagreements
 * naming one of `seqs` (in a backup, keys name utterances by seq; see src/core/backup/dismissed.ts).
 */
export function dismissedArbitrary(seqs: readonly number[]): fc.Arbitrary<Record<string, BackupDismissal> | undefined> {
  const words = fc.array(fc.constantFrom('fix', 'tap', 'Friday', 'ברז', '🔧'), { minLength: 1, maxLength: 3 });
  const tags = fc.array(fc.constantFrom(...TAG_POOL), { minLength: 1, maxLength: 3 });
  const keys: fc.Arbitrary<string>[] = [
    words.map((tokens) => findingKey({ kind: 'variation', tokens, nucleus: { start: 0, end: 1 }, fringe: true, readings: [], occurrences: 2 })),
    fc.tuple(text, fc.constantFrom(...SLOTS)).map(([value, slot]) =>
      findingKey({ kind: 'slot-outlier', value, slot, count: 1, majoritySlot: 'area', majorityCount: 9, ratio: 9, locations: [] }),
    ),
  ];
  if (seqs.length > 0) {
    keys.push(
      fc.tuple(fc.constantFrom(...seqs), fc.constantFrom('ana', 'gold'), words, tags, tags).map(([seq, layer, tokens, annotatorTags, modelTags]) =>
        findingKey({ kind: 'model-disagreement', location: { id: String(seq), layer, start: 0, end: 1 }, tokens, annotatorTags, modelTags, confidence: 0.5 }),
      ),
    );
  }
  return optional(fc.dictionary(fc.oneof(...keys), dismissalArbitrary, { minKeys: 1, maxKeys: 4 }));
}

export const backupDataArbitrary: fc.Arbitrary<BackupData> = fc
  .tuple(projectArbitrary, annotatorsArbitrary, fc.array(batchArbitrary, { maxLength: 3 }), optional(exchangeArbitrary), optional(storedModelArbitrary))
  .chain(([info, annotators, batches, exchange, model]) =>
    utterancesArbitrary(batches.length).chain((utterances) => {
      const owners = [...annotators.map((a) => a.id), 'gold', 'model'];
      const slots = utterances.flatMap((u) => owners.map((annotator) => ({ seq: u.seq, annotator, count: u.tokens.length / 2 })));
      const layerFor = (slot: (typeof slots)[number]) =>
        fc.record({
          content: contentArbitrary(slot.count),
          batch: batches.length === 0 ? fc.constant(undefined) : optional(fc.integer({ min: 1, max: batches.length })),
          history: fc.array(fc.tuple(fc.option(contentArbitrary(slot.count), { nil: null }), contentArbitrary(slot.count), fc.constantFrom('ana', 'cy'), time), { maxLength: 2 }),
        }).map(({ content, batch, history }) => ({
          layer: defined<BackupLayer>({ seq: slot.seq, annotator: slot.annotator, ...content, batch }),
          history: history.map(([before, after, who, when]): BackupHistory => ({ seq: slot.seq, annotator: slot.annotator, before, after, who, when })),
        }));
      const made = fc.subarray(slots, { maxLength: Math.min(8, slots.length) }).chain((chosen) => fc.tuple(...chosen.map(layerFor)));
      return fc.tuple(made, dismissedArbitrary(utterances.map((u) => u.seq))).map(([made, dismissed]) => ({
        project: defined<BackupData['project']>({ ...info, exchange, model, dismissed }),
        annotators,
        batches,
        utterances,
        layers: made.map((m) => m.layer),
        history: made.flatMap((m) => m.history),
      }));
    }),
  );

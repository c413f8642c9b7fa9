/**
 * The project record's `exchange`, `model` and `dismissed`: the unindexed fields other stores add to
 * the project row (src/db/exchange-repo.ts, model-repo.ts, findings-repo.ts). They ride in the project
 * record rather than records of their own because they are fields of that one row: restore writes
 * them with it, and the one-project check already covers them, while separate optional records
 * would need counts of their own for a cut file to be noticed.
 *
 * Unlike the lenient rest of the record, these are read strictly: each is absent or wholly right,
 * else an error names the line: half an exchange, or a model that will not load, restored without
 * a word would fail later, far from its cause. One exception: a model file of another model version or
 * feature set is kept with a warning. The Model screen already shows such a stored model as not
 * readable by this version, and refusing the whole project over it would lose more than it saves.
 *
 * Unknown keys here warn and are ignored: they cannot come from this format version (a newer
 * Slotsmith that adds fields bumps the version and is refused), so they are hand edits; a warning
 * shows that something was left behind, where silence is how these three fields once got lost.
 */
import { CRF_FEATURE_SET } from '../crf/attributes';
import type { CrossValidation } from '../crf/cross-validate';
import type { SpanEvaluation, SpanFigures } from '../crf/evaluate';
import { CRF_MODEL_FORMAT, CRF_MODEL_VERSION, crfModelFromJson } from '../crf/model-file';
import { isPlainObject, type FieldReader } from './fields';
import type { BackupDismissal, BackupExchange, BackupModel, BackupPackEntry } from './model';

/** Warn about keys outside `known` (see the file comment). */
export function keysUnknownWarn(r: FieldReader, known: readonly string[]): void {
  for (const key of Object.keys(r.value)) if (!known.includes(key)) r.warn(`"${key}" is not known to this version; ignored`);
}

function fraction(r: FieldReader, key: string): number {
  const v = r.value[key];
  if (typeof v === 'number' && v >= 0 && v <= 1) return v;
  r.fail(`"${key}" must be a number from 0 to 1`);
  return 0;
}

/** A list of nested objects, every item required to be sound. */
function objectList<T>(r: FieldReader, key: string, what: string, item: (child: FieldReader) => T): T[] {
  const v = r.value[key];
  if (!Array.isArray(v)) {
    r.fail(`"${key}" must be a list`);
    return [];
  }
  return v.flatMap((raw, i) => {
    if (isPlainObject(raw)) return [item(r.nested(raw, `${what} ${i + 1}`))];
    r.fail(`${what} ${i + 1} must be an object`);
    return [];
  });
}

const PACK_KEYS = ['id', 'annotator', 'created', 'seqs'];
const EXCHANGE_KEYS = ['uid', 'role', 'name', 'packs'];

function packRead(r: FieldReader): BackupPackEntry {
  keysUnknownWarn(r, PACK_KEYS);
  const id = r.string('id');
  // Pack ids are SHA-256 hex of the pack body (src/core/exchange/pack.ts, FIPS 180-4 digest size).
  if (typeof r.value.id === 'string' && !/^[0-9a-f]{64}$/.test(id)) r.fail('"id" must be 64 hex digits');
  const annotator = r.string('annotator');
  if (typeof r.value.annotator === 'string' && annotator === '') r.fail('"annotator" is empty');
  const created = r.integer('created');
  const seqs = r.value.seqs;
  if (!Array.isArray(seqs) || !seqs.every((s) => Number.isSafeInteger(s) && (s as number) >= 1)) r.fail('"seqs" must be a list of whole numbers of at least 1');
  return { id, annotator, created, seqs: Array.isArray(seqs) ? (seqs as number[]) : [] };
}

function exchangeRead(r: FieldReader): BackupExchange {
  keysUnknownWarn(r, EXCHANGE_KEYS);
  const uid = r.string('uid');
  // 128 random bits as hex, as uidRandom makes and pack headers require (src/core/exchange).
  if (typeof r.value.uid === 'string' && !/^[0-9a-f]{32}$/.test(uid)) r.fail('"uid" must be 32 hex digits');
  const role = r.choice('role', ['master', 'copy'] as const);
  const name = r.value.name;
  if (name !== undefined && typeof name !== 'string') r.fail('"name" must be a string');
  const packs = objectList(r, 'packs', 'pack', packRead);
  return typeof name === 'string' ? { uid, role, name, packs } : { uid, role, packs };
}

const FIGURES_KEYS = ['truePositives', 'falsePositives', 'falseNegatives', 'precision', 'recall', 'f1'];
const EVALUATION_KEYS = ['slots', 'overall', 'utterances', 'exactUtterances'];
const CROSS_VALIDATION_KEYS = ['folds', 'pooled', 'perFold'];
const MODEL_KEYS = ['json', 'saved', 'origin', 'crossValidation'];
/** Stands in for a part already reported missing, so no further errors pile up about it. */
const FIGURES_NONE: SpanFigures = { truePositives: 0, falsePositives: 0, falseNegatives: 0, precision: 0, recall: 0, f1: 0 };

function figuresRead(r: FieldReader): SpanFigures {
  keysUnknownWarn(r, FIGURES_KEYS);
  return {
    truePositives: r.integer('truePositives'),
    falsePositives: r.integer('falsePositives'),
    falseNegatives: r.integer('falseNegatives'),
    precision: fraction(r, 'precision'),
    recall: fraction(r, 'recall'),
    f1: fraction(r, 'f1'),
  };
}

function evaluationRead(r: FieldReader): SpanEvaluation {
  keysUnknownWarn(r, EVALUATION_KEYS);
  const slots = r.object('slots', 'slots');
  const entries = slots === null ? [] : Object.entries(slots.value).flatMap(([name, raw]): [string, SpanFigures][] => {
    if (isPlainObject(raw)) return [[name, figuresRead(slots.nested(raw, `slot "${name}"`))]];
    slots.fail(`slot "${name}" must be an object`);
    return [];
  });
  const overall = r.object('overall', 'overall');
  return {
    slots: Object.fromEntries(entries),
    overall: overall === null ? FIGURES_NONE : figuresRead(overall),
    utterances: r.integer('utterances'),
    exactUtterances: r.integer('exactUtterances'),
  };
}

function crossValidationRead(r: FieldReader): CrossValidation {
  keysUnknownWarn(r, CROSS_VALIDATION_KEYS);
  // Cross-validation needs at least two folds and keeps one evaluation per fold (src/core/crf/cross-validate.ts).
  const folds = r.integer('folds', 2);
  const pooledReader = r.object('pooled', 'pooled');
  const pooled = pooledReader === null ? { slots: {}, overall: FIGURES_NONE, utterances: 0, exactUtterances: 0 } : evaluationRead(pooledReader);
  const perFold = objectList(r, 'perFold', 'fold', evaluationRead);
  if (!r.failed && perFold.length !== folds) r.fail(`"perFold" has ${perFold.length} evaluations for ${folds} folds`);
  return { folds, pooled, perFold };
}

export type ModelFileVerdict = { kind: 'sound' } | { kind: 'foreign' | 'broken'; message: string };

/**
 * Whether the model-file reader (src/core/crf/model-file.ts) takes the text. 'foreign': a model file
 * of another model version or feature set, which this build cannot tag with but the Model screen
 * shows as such; 'broken': anything else, which no build could use.
 */
export function backupModelFileCheck(json: string): ModelFileVerdict {
  try {
    crfModelFromJson(json);
    return { kind: 'sound' };
  } catch (error) {
    const message = (error as Error).message;
    let head: unknown = null;
    try {
      head = JSON.parse(json);
    } catch {
      // Not JSON at all: broken, with the reader's own message.
    }
    const foreign = isPlainObject(head) && head.format === CRF_MODEL_FORMAT && (head.version !== CRF_MODEL_VERSION || head.featureSet !== CRF_FEATURE_SET);
    return { kind: foreign ? 'foreign' : 'broken', message };
  }
}

function modelRead(r: FieldReader): BackupModel | null {
  keysUnknownWarn(r, MODEL_KEYS);
  const json = r.string('json');
  const saved = r.integer('saved');
  const origin = r.choice('origin', ['trained', 'file'] as const);
  let crossValidation: CrossValidation | null = null;
  const cv = r.value.crossValidation;
  if (isPlainObject(cv)) crossValidation = crossValidationRead(r.nested(cv, 'crossValidation'));
  else if (cv !== null) r.fail('"crossValidation" must be an object or null');
  if (r.failed) return null;
  const verdict = backupModelFileCheck(json);
  if (verdict.kind === 'broken') r.fail(`"json" is not a usable model file (${verdict.message})`);
  else if (verdict.kind === 'foreign') r.warn(`kept, but this version cannot tag with it (${verdict.message})`);
  return r.failed ? null : { json, saved, origin, crossValidation };
}

const DISMISSAL_KEYS = ['when', 'who'];

function dismissedRead(r: FieldReader): Record<string, BackupDismissal> {
  const entries: [string, BackupDismissal][] = [];
  for (const [key, raw] of Object.entries(r.value)) {
    if (key === '') r.fail('a finding key is empty');
    if (!isPlainObject(raw)) {
      r.fail(`finding ${JSON.stringify(key)} must be an object`);
      continue;
    }
    const d = r.nested(raw, `finding ${JSON.stringify(key)}`);
    keysUnknownWarn(d, DISMISSAL_KEYS);
    const when = d.integer('when');
    const who = d.value.who;
    if (who !== null && typeof who !== 'string') d.fail('"who" must be a string or null');
    entries.push([key, { when, who: typeof who === 'string' ? who : null }]);
  }
  // fromEntries defines own properties, so even a "__proto__" key stays a plain entry.
  return Object.fromEntries(entries);
}

export interface ProjectExtras {
  exchange?: BackupExchange;
  model?: BackupModel;
  dismissed?: Record<string, BackupDismissal>;
}

export const PROJECT_EXTRA_KEYS = ['exchange', 'model', 'dismissed'] as const;

/** The extras of a project record (absent ones left out); failures go to `r`. */
export function projectExtrasRead(r: FieldReader): ProjectExtras {
  const extras: ProjectExtras = {};
  if (r.value.exchange !== undefined) {
    const e = r.object('exchange', 'exchange');
    if (e !== null) extras.exchange = exchangeRead(e);
  }
  if (r.value.model !== undefined) {
    const m = r.object('model', 'model');
    const model = m === null ? null : modelRead(m);
    if (model !== null) extras.model = model;
  }
  if (r.value.dismissed !== undefined) {
    const d = r.object('dismissed', 'dismissed');
    const dismissed = d === null ? {} : dismissedRead(d);
    // Empty means none, as findings-repo drops the field rather than store {}.
    if (Object.keys(dismissed).length > 0) extras.dismissed = dismissed;
  }
  return extras;
}

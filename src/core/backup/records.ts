/** Per-record validation and lenient restore: one parsed JSON line in, a typed record (or null) out. */
import type { TokeniserSpec } from '../tokenise';
import { SCHEMES, type ReadError } from '../types';
import { FieldReader, isPlainObject, withDefined } from './fields';
import {
  ANNOTATOR_ROLES,
  LAYER_STATUSES,
  type AnnotatorInfo,
  type BackupHistory,
  type BackupLayer,
  type BackupUtterance,
  type BatchInfo,
  type IntentDef,
  type BackupProject,
  type LayerContent,
  type ProjectSchema,
  type SlotDef,
} from './model';
import { keysUnknownWarn, PROJECT_EXTRA_KEYS, projectExtrasRead } from './project-extras';

function tokeniserRead(r: FieldReader): TokeniserSpec {
  const v = r.value.tokeniser;
  if (isPlainObject(v)) {
    if (v.kind === 'words' || v.kind === 'whitespace') return { kind: v.kind };
    if (v.kind === 'regex' && typeof v.pattern === 'string') {
      const spec: TokeniserSpec = { kind: 'regex', pattern: v.pattern };
      if (typeof v.flags === 'string') spec.flags = v.flags;
      return spec;
    }
  }
  r.warn('"tokeniser" is not understood; using words');
  return { kind: 'words' };
}

function listRead<T>(r: FieldReader, key: string, what: string, item: (child: FieldReader) => T | null): T[] {
  const v = r.value[key];
  if (v === undefined) return [];
  if (!Array.isArray(v)) {
    r.warn(`"${key}" is not a list; dropped`);
    return [];
  }
  const out: T[] = [];
  v.forEach((raw, i) => {
    // A bad list item is dropped with a warning; the record itself stays sound.
    const own = { errors: [] as ReadError[], warnings: r.issues.warnings };
    const got = isPlainObject(raw) ? item(new FieldReader(raw, r.line, own, `${what} ${i + 1}`)) : null;
    if (got !== null) out.push(got);
    else r.warn(`${what} ${i + 1} dropped (${own.errors.map((e) => e.message).join('; ') || 'not an object'})`);
  });
  return out;
}

function slotRead(r: FieldReader): SlotDef | null {
  const name = r.string('name');
  if (r.failed) return null;
  return withDefined<SlotDef>(
    { name },
    {
      key: r.stringOptional('key'),
      colour: r.stringOptional('colour'),
      description: r.stringOptional('description'),
      examples: r.stringArrayOptional('examples'),
      intents: r.stringArrayOptional('intents'),
    },
  );
}

function intentRead(r: FieldReader): IntentDef | null {
  const name = r.string('name');
  if (r.failed) return null;
  return withDefined<IntentDef>({ name }, { description: r.stringOptional('description') });
}

function schemaRead(r: FieldReader): ProjectSchema {
  const v = r.value.schema;
  if (v === undefined) return { slots: [], intents: [] };
  if (!isPlainObject(v)) {
    r.warn('"schema" is not an object; using an empty one');
    return { slots: [], intents: [] };
  }
  const s = r.nested(v, 'schema');
  return { slots: listRead(s, 'slots', 'slot', slotRead), intents: listRead(s, 'intents', 'intent', intentRead) };
}

const PROJECT_KEYS = ['type', 'name', 'created', 'updated', 'tokeniser', 'scheme', 'schema', ...PROJECT_EXTRA_KEYS];

export function projectRead(r: FieldReader): BackupProject | null {
  // A warning, not an error, for the reason given in project-extras.ts.
  keysUnknownWarn(r, PROJECT_KEYS);
  const project: BackupProject = {
    name: r.string('name'),
    created: r.integer('created'),
    updated: r.integer('updated'),
    tokeniser: tokeniserRead(r),
    scheme: r.choice('scheme', SCHEMES, 'iob2'),
    schema: schemaRead(r),
    ...projectExtrasRead(r),
  };
  return r.failed ? null : project;
}

export function annotatorRead(r: FieldReader): AnnotatorInfo | null {
  const id = r.string('id');
  if (id === '') r.fail('"id" is empty');
  const annotator: AnnotatorInfo = { id, name: r.stringOptional('name') ?? id, role: r.choice('role', ANNOTATOR_ROLES, 'annotator') };
  return r.failed ? null : annotator;
}

function warningRead(r: FieldReader): ReadError | null {
  const warning = { line: r.integer('line'), message: r.string('message') };
  return r.failed ? null : warning;
}

export function batchRead(r: FieldReader): BatchInfo | null {
  const importing = r.value.state === 'importing';
  if (importing) r.fail('a backup never holds a running import (state "importing")');
  const counts = r.object('counts', 'counts');
  const batch = withDefined<BatchInfo>(
    {
      fileName: r.string('fileName'),
      format: r.string('format'),
      counts: { utterances: counts?.integer('utterances') ?? 0, tokens: counts?.integer('tokens') ?? 0, layers: counts?.integer('layers') ?? 0 },
      warnings: listRead(r, 'warnings', 'warning', warningRead),
      state: importing ? 'failed' : r.choice('state', ['done', 'failed', 'cancelled'] as const),
      created: r.integer('created'),
    },
    {
      annotator: r.stringOptional('annotator'),
      layerStatus: r.value.layerStatus === undefined ? undefined : r.choice('layerStatus', LAYER_STATUSES, 'done'),
      attached: r.integerOptional('attached'),
      finished: r.integerOptional('finished'),
      failure: r.stringOptional('failure'),
    },
  );
  return r.failed ? null : batch;
}

/** Start,end pairs inside the text, in order, not overlapping, none empty. */
function tokensRead(r: FieldReader, textLength: number): number[] {
  const v = r.value.tokens;
  if (!Array.isArray(v) || v.length % 2 !== 0 || !v.every((x) => Number.isSafeInteger(x))) {
    r.fail('"tokens" must be a list of start,end number pairs');
    return [];
  }
  const tokens = v as number[];
  let free = 0;
  for (let i = 0; i < tokens.length; i += 2) {
    const start = tokens[i] as number;
    const end = tokens[i + 1] as number;
    if (start < free || end <= start || end > textLength) {
      r.fail(`token ${i / 2 + 1} [${start}, ${end}) is not inside the text after the previous token`);
      break;
    }
    free = end;
  }
  return tokens;
}

function metaRead(r: FieldReader): Record<string, string> {
  const v = r.value.meta;
  const meta: Record<string, string> = {};
  if (v === undefined) return meta;
  if (!isPlainObject(v)) {
    r.warn('"meta" is not an object; dropped');
    return meta;
  }
  for (const [key, value] of Object.entries(v)) {
    if (typeof value === 'string') meta[key] = value;
    else r.warn(`meta "${key}" is not a string; dropped`);
  }
  return meta;
}

export function utteranceRead(r: FieldReader): BackupUtterance | null {
  const seq = r.integer('seq', 1);
  const text = r.string('text');
  const utterance = withDefined<BackupUtterance>(
    { seq, text, tokens: tokensRead(r, text.length), meta: metaRead(r) },
    {
      externalId: r.stringOptional('externalId'),
      intentHint: r.stringOptional('intentHint'),
      batch: r.integerOptional('batch', 1),
      line: r.integerOptional('line', 1),
    },
  );
  return r.failed ? null : utterance;
}

function contentRead(r: FieldReader): LayerContent {
  return {
    tags: r.stringArray('tags'),
    intent: r.stringOrNull('intent'),
    status: r.choice('status', LAYER_STATUSES, 'draft'),
    note: r.stringOptional('note') ?? '',
    revision: r.integer('revision', 1),
    updated: r.integer('updated'),
  };
}

export function layerRead(r: FieldReader): BackupLayer | null {
  const layer = withDefined<BackupLayer>(
    { seq: r.integer('seq', 1), annotator: r.string('annotator'), ...contentRead(r) },
    { batch: r.integerOptional('batch', 1) },
  );
  return r.failed ? null : layer;
}

export function historyRead(r: FieldReader): BackupHistory | null {
  const seq = r.integer('seq', 1);
  const annotator = r.string('annotator');
  let before: LayerContent | null = null;
  if (r.value.before !== null && r.value.before !== undefined) {
    const b = r.object('before', 'before');
    before = b === null ? null : contentRead(b);
  }
  const a = r.object('after', 'after');
  const after = a === null ? null : contentRead(a);
  const history = { seq, annotator, before, after, who: r.string('who'), when: r.integer('when') };
  return r.failed || after === null ? null : { ...history, after };
}

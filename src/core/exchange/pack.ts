/** Pack files: write and read (see model.ts). Readers never throw. */
import { FieldReader, isPlainObject, withDefined, type Issues } from '../backup/fields';
import { ANNOTATORS_RESERVED, type ProjectInfo } from '../backup/model';
import { projectRead, utteranceRead } from '../backup/records';
import { linesDecode, linesEncode } from './lines';
import { EXCHANGE_FORMAT_VERSION, PACK_FORMAT, type ExchangeProject, type ExchangeRead, type PackFile, type PackHeader, type PackUtterance } from './model';

export interface PackWriteInput {
  created: string;
  project: ExchangeProject;
  annotator: { id: string; name: string };
  setup: ProjectInfo;
  suggestionsFrom?: string;
  utterances: readonly PackUtterance[];
}

function setupCanonical(p: ProjectInfo): ProjectInfo {
  return { name: p.name, created: p.created, updated: p.updated, tokeniser: p.tokeniser, scheme: p.scheme, schema: p.schema };
}

function utteranceRecord(u: PackUtterance): object {
  return {
    type: 'utterance',
    seq: u.seq,
    externalId: u.externalId,
    text: u.text,
    tokens: u.tokens,
    meta: u.meta,
    suggestion: u.suggestion === undefined ? undefined : { tags: u.suggestion.tags, intent: u.suggestion.intent },
  };
}

/** The pack as file text; equal input gives equal bytes. */
export function packWrite(input: PackWriteInput): Promise<string> {
  const header = {
    format: PACK_FORMAT,
    version: EXCHANGE_FORMAT_VERSION,
    created: input.created,
    project: { uid: input.project.uid, name: input.project.name },
    annotator: { id: input.annotator.id, name: input.annotator.name },
    setup: setupCanonical(input.setup),
    suggestionsFrom: input.suggestionsFrom,
  };
  return linesEncode(header, input.utterances.map(utteranceRecord));
}

/** Project reference of a header: uid and name, both required. */
export function exchangeProjectRead(r: FieldReader): ExchangeProject {
  const p = r.object('project', 'project');
  const uid = p?.string('uid') ?? '';
  if (p !== null && !/^[0-9a-f]{32}$/.test(uid)) p.fail('"uid" must be 32 hex digits');
  return { uid, name: p?.string('name') ?? '' };
}

function suggestionRead(r: FieldReader, tokenCount: number): PackUtterance['suggestion'] {
  const v = r.value.suggestion;
  if (v === undefined) return undefined;
  if (!isPlainObject(v)) {
    r.fail('"suggestion" must be an object');
    return undefined;
  }
  const s = r.nested(v, 'suggestion');
  const tags = s.stringArray('tags');
  if (tags.length !== tokenCount) s.fail(`${tags.length} tags for ${tokenCount} tokens`);
  return { tags, intent: s.stringOrNull('intent') };
}

/** Read and check a pack; any problem refuses the whole file. */
export async function packRead(text: string): Promise<ExchangeRead<PackFile>> {
  const decoded = await linesDecode(text, PACK_FORMAT);
  if (!decoded.ok) return decoded;
  const issues: Issues = { errors: [], warnings: [] };
  const h = new FieldReader(decoded.decoded.header, 1, issues, 'header');
  const project = exchangeProjectRead(h);
  const who = h.object('annotator', 'annotator');
  const annotatorId = who?.string('id') ?? '';
  if (who !== null && (annotatorId.trim() === '' || ANNOTATORS_RESERVED.includes(annotatorId))) who.fail(`"id" ${JSON.stringify(annotatorId)} cannot own a layer`);
  const setupReader = h.object('setup', 'setup');
  const setup = setupReader === null ? null : projectRead(setupReader);
  const header = withDefined<PackHeader>(
    {
      format: PACK_FORMAT,
      version: h.integer('version', 1),
      created: h.string('created'),
      project,
      annotator: { id: annotatorId, name: who?.stringOptional('name') ?? annotatorId },
      setup: setup ?? { name: '', created: 0, updated: 0, tokeniser: { kind: 'words' }, scheme: 'iob2', schema: { slots: [], intents: [] } },
      count: h.integer('count'),
      bodySha256: h.string('bodySha256'),
    },
    { suggestionsFrom: h.stringOptional('suggestionsFrom') },
  );
  const utterances: PackUtterance[] = [];
  const seqs = new Set<number>();
  for (const { line, value } of decoded.decoded.records) {
    const r = new FieldReader(value, line, issues, 'utterance');
    if (value.type !== 'utterance') {
      r.fail(`unknown record type ${JSON.stringify(value.type)}`);
      continue;
    }
    const u = utteranceRead(r);
    if (u === null) continue;
    if (seqs.has(u.seq)) r.fail(`seq ${u.seq} appears twice`);
    seqs.add(u.seq);
    const suggestion = suggestionRead(r, u.tokens.length / 2);
    if (r.failed) continue;
    utterances.push(withDefined<PackUtterance>({ seq: u.seq, text: u.text, tokens: u.tokens, meta: u.meta }, { externalId: u.externalId, suggestion }));
  }
  if (issues.errors.length > 0) return { ok: false, errors: issues.errors };
  return { ok: true, file: { header, utterances }, warnings: issues.warnings };
}

/** Layer files (one annotator's layers handed back): write and read. Readers never throw. */
import { FieldReader, withDefined, type Issues } from '../backup/fields';
import { layerRead } from '../backup/records';
import { linesDecode, linesEncode } from './lines';
import { EXCHANGE_FORMAT_VERSION, LAYERS_FORMAT, type ExchangeProject, type ExchangeRead, type LayerRecord, type LayersFile, type LayersHeader } from './model';
import { exchangeProjectRead } from './pack';

export interface LayersWriteInput {
  created: string;
  project: ExchangeProject;
  annotator: string;
  pack?: string;
  layers: readonly LayerRecord[];
}

function layerRecord(l: LayerRecord): object {
  return {
    type: 'layer',
    seq: l.seq,
    externalId: l.externalId,
    tokenCount: l.tokenCount,
    annotator: l.annotator,
    tags: l.tags,
    intent: l.intent,
    status: l.status,
    note: l.note,
    revision: l.revision,
    updated: l.updated,
  };
}

/** The layer file as text; every record must belong to `annotator`. */
export function layersWrite(input: LayersWriteInput): Promise<string> {
  const header = {
    format: LAYERS_FORMAT,
    version: EXCHANGE_FORMAT_VERSION,
    created: input.created,
    project: { uid: input.project.uid, name: input.project.name },
    annotator: input.annotator,
    pack: input.pack,
  };
  return linesEncode(header, input.layers.map(layerRecord));
}

/** Read and check a layer file; any problem refuses the whole file. */
export async function layersRead(text: string): Promise<ExchangeRead<LayersFile>> {
  const decoded = await linesDecode(text, LAYERS_FORMAT);
  if (!decoded.ok) return decoded;
  const issues: Issues = { errors: [], warnings: [] };
  const h = new FieldReader(decoded.decoded.header, 1, issues, 'header');
  const annotator = h.string('annotator');
  if (annotator.trim() === '') h.fail('"annotator" is empty');
  const header = withDefined<LayersHeader>(
    {
      format: LAYERS_FORMAT,
      version: h.integer('version', 1),
      created: h.string('created'),
      project: exchangeProjectRead(h),
      annotator,
      count: h.integer('count'),
      bodySha256: h.string('bodySha256'),
    },
    { pack: h.stringOptional('pack') },
  );
  const layers: LayerRecord[] = [];
  const seqs = new Set<number>();
  for (const { line, value } of decoded.decoded.records) {
    const r = new FieldReader(value, line, issues, 'layer');
    if (value.type !== 'layer') {
      r.fail(`unknown record type ${JSON.stringify(value.type)}`);
      continue;
    }
    const l = layerRead(r);
    const tokenCount = r.integer('tokenCount');
    const externalId = r.stringOptional('externalId');
    if (l === null || r.failed) continue;
    if (l.annotator !== annotator) r.fail(`belongs to "${l.annotator}", but the file is "${annotator}"'s`);
    if (l.tags.length !== tokenCount) r.fail(`${l.tags.length} tags for ${tokenCount} tokens`);
    if (seqs.has(l.seq)) r.fail(`seq ${l.seq} appears twice`);
    seqs.add(l.seq);
    if (r.failed) continue;
    const { batch: _batch, ...content } = l;
    layers.push(withDefined<LayerRecord>({ ...content, tokenCount }, { externalId }));
  }
  if (issues.errors.length > 0) return { ok: false, errors: issues.errors };
  return { ok: true, file: { header, layers }, warnings: issues.warnings };
}

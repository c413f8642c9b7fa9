/**
 * The likely-mistake scan: reads the chosen layers slice by slice, tags them with the project's
 * saved model when there is one, runs the detectors of src/core/error-detect and returns the
 * findings with their keys. Kept apart from the worker entry so it runs the same in Node tests.
 */
import Dexie from 'dexie';
import { ANNOTATOR_GOLD, type LayerStatus } from '../core/backup/model';
import { crfModelFromJson, crfTagger, type CrfTagger } from '../core/crf';
import {
  findingKey,
  identicalFind,
  modelDisagreementsFind,
  slotOutliersFind,
  variationFind,
  type Finding,
  type LabelledUtterance,
  type ModelComparedUtterance,
} from '../core/error-detect';
import { RecordMissingError } from '../db/errors';
import { projectModel } from '../db/model-repo';
import type { LayerKey, SlotsmithDb, UtteranceRow } from '../db/schema';
import { tokensUnpack } from '../db/tokens';
import { findingsAcrossUtterances, findingsLayersChoose, LOCATIONS_SHOWN, type LayerRef } from './findings-choose';

export { FINDING_KINDS, LOCATIONS_SHOWN } from './findings-choose';

export interface FindingsScanProgress {
  phase: 'reading' | 'tagging' | 'checking';
  done: number;
  total: number;
}

export type ModelUse =
  | { kind: 'used'; saved: number; origin: 'trained' | 'file' }
  | { kind: 'none' }
  | { kind: 'unreadable'; message: string };

export interface ScanFinding {
  key: string;
  finding: Finding;
}

export interface ScanUtterance {
  seq: number;
  words: string[];
}

export interface FindingsScan {
  projectId: number;
  layersChecked: number;
  utterancesChecked: number;
  /** Layers taken from the gold layer, and from people's done layers. */
  fromGold: number;
  fromPeople: number;
  /** Grouped by kind in FINDING_KINDS order; within a kind, the core's ranking. */
  findings: ScanFinding[];
  /** Variation and identical findings left out because all their places were one utterance. */
  sameUtteranceDropped: number;
  model: ModelUse;
  /** By utterance id (as text): the words of the utterances the listed places point at. */
  utterances: Record<string, ScanUtterance>;
}

// Slices keep progress flowing and a 100k-layer project from being read in one go.
const CHUNK = 1000;

/** Every layer of the project as (utterance, owner, status), from the index alone: no row is read. */
async function layerRefsRead(db: SlotsmithDb, projectId: number): Promise<LayerRef[]> {
  const { minKey, maxKey } = Dexie;
  return db.transaction('r', db.layers, async () => {
    const range = () => db.layers.where('[projectId+annotator+status]').between([projectId, minKey, minKey], [projectId, maxKey, maxKey], true, true);
    // Both lists walk the same index in the same transaction, so they line up entry by entry.
    const indexKeys = (await range().keys()) as unknown as [number, string, LayerStatus][];
    const primaryKeys = (await range().primaryKeys()) as unknown as LayerKey[];
    return primaryKeys.map(([utteranceId, annotator], i) => ({ utteranceId, annotator, status: (indexKeys[i] as [number, string, LayerStatus])[2] }));
  });
}

async function layersLabelledRead(
  db: SlotsmithDb,
  refs: readonly LayerRef[],
  onProgress: (p: FindingsScanProgress) => void,
): Promise<{ labelled: LabelledUtterance[]; rows: Map<number, ScanUtterance> }> {
  const labelled: LabelledUtterance[] = [];
  const rows = new Map<number, ScanUtterance>();
  for (let i = 0; i < refs.length; i += CHUNK) {
    const slice = refs.slice(i, i + CHUNK);
    const layers = await db.layers.bulkGet(slice.map((r): LayerKey => [r.utteranceId, r.annotator]));
    const wanted = [...new Set(slice.map((r) => r.utteranceId))].filter((id) => !rows.has(id));
    const utterances = await db.utterances.bulkGet(wanted);
    for (const u of utterances.filter((x): x is UtteranceRow => x !== undefined)) {
      rows.set(u.id, { seq: u.seq, words: tokensUnpack(u.tokens).map((t) => u.text.slice(t.start, t.end)) });
    }
    slice.forEach((ref, j) => {
      const layer = layers[j];
      const row = rows.get(ref.utteranceId);
      // A layer or utterance deleted since the keys were read (another tab) is simply not checked.
      if (layer === undefined || row === undefined) return;
      labelled.push({ id: String(ref.utteranceId), layer: ref.annotator, tokens: row.words, tags: layer.tags, ...(layer.intent === null ? {} : { intent: layer.intent }) });
    });
    onProgress({ phase: 'reading', done: Math.min(refs.length, i + CHUNK), total: refs.length });
  }
  return { labelled, rows };
}

/** The saved model's tagger, or why there is none. */
async function modelTaggerOf(db: SlotsmithDb, projectId: number): Promise<{ tagger: CrfTagger | null; use: ModelUse }> {
  const stored = await projectModel(db, projectId);
  if (stored === null) return { tagger: null, use: { kind: 'none' } };
  try {
    return { tagger: crfTagger(crfModelFromJson(stored.json)), use: { kind: 'used', saved: stored.saved, origin: stored.origin } };
  } catch (error) {
    return { tagger: null, use: { kind: 'unreadable', message: (error as Error).message } };
  }
}

function modelCompare(tagger: CrfTagger, labelled: readonly LabelledUtterance[], onProgress: (p: FindingsScanProgress) => void): ModelComparedUtterance[] {
  // Two people's layers of one utterance share its words: tag each utterance once.
  const tagged = new Map<string, { tags: string[]; confidences: number[] }>();
  return labelled.map((u, i) => {
    let result = tagged.get(u.id);
    if (result === undefined) {
      const tagging = tagger.tag(u.tokens);
      result = { tags: tagging.tags, confidences: Array.from(tagging.confidence) };
      tagged.set(u.id, result);
    }
    if ((i + 1) % CHUNK === 0 || i + 1 === labelled.length) onProgress({ phase: 'tagging', done: i + 1, total: labelled.length });
    return { ...u, modelTags: result.tags, confidences: result.confidences };
  });
}

/** Words of the utterances behind the first LOCATIONS_SHOWN places of each reading. */
function utterancesShown(findings: readonly Finding[], rows: ReadonlyMap<number, ScanUtterance>): Record<string, ScanUtterance> {
  const out: Record<string, ScanUtterance> = {};
  const add = (id: string) => {
    const row = rows.get(Number(id));
    if (row !== undefined) out[id] = row;
  };
  for (const finding of findings) {
    if (finding.kind === 'variation' || finding.kind === 'identical') for (const r of finding.readings) r.locations.slice(0, LOCATIONS_SHOWN).forEach((l) => add(l.id));
    else if (finding.kind === 'slot-outlier') finding.locations.slice(0, LOCATIONS_SHOWN).forEach((l) => add(l.id));
    else add(finding.location.id);
  }
  return out;
}

export async function findingsScan(db: SlotsmithDb, projectId: number, onProgress: (p: FindingsScanProgress) => void = () => {}): Promise<FindingsScan> {
  if ((await db.projects.get(projectId)) === undefined) throw new RecordMissingError('project', projectId);
  const refs = findingsLayersChoose(await layerRefsRead(db, projectId));
  onProgress({ phase: 'reading', done: 0, total: refs.length });
  const { labelled, rows } = await layersLabelledRead(db, refs, onProgress);
  const { tagger, use } = await modelTaggerOf(db, projectId);
  const compared = tagger === null ? null : modelCompare(tagger, labelled, onProgress);
  const detectors: (() => Finding[])[] = [
    () => variationFind(labelled),
    () => identicalFind(labelled),
    () => slotOutliersFind(labelled),
    () => (compared === null ? [] : modelDisagreementsFind(compared)),
  ];
  const found: Finding[] = [];
  detectors.forEach((run, i) => {
    onProgress({ phase: 'checking', done: i, total: detectors.length });
    found.push(...run());
  });
  onProgress({ phase: 'checking', done: detectors.length, total: detectors.length });
  const { kept, dropped } = findingsAcrossUtterances(found);
  const gold = labelled.filter((u) => u.layer === ANNOTATOR_GOLD).length;
  return {
    projectId,
    layersChecked: labelled.length,
    utterancesChecked: rows.size,
    fromGold: gold,
    fromPeople: labelled.length - gold,
    findings: kept.map((finding) => ({ key: findingKey(finding), finding })),
    sameUtteranceDropped: dropped,
    model: use,
    utterances: utterancesShown(kept, rows),
  };
}

/**
 * The corpus overview's figures in one pass over the project's layers: label distribution (spans
 * per slot read the CoNLL-2000 way, intents), progress per annotator, completed layers over time,
 * and a few headline numbers. Runs in the agreement worker; tests run it on fake-indexeddb.
 */
import { ANNOTATORS_RESERVED, LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import { spansFromTags } from '../core/schemes';
import type { LayerRow, SlotsmithDb } from '../db/schema';
import { utteranceCount } from '../db/utterance-repo';
import { corpusIndexSignature } from '../db/corpus-index';
import { layerCopiesVisit } from '../db/layer-copy';
import type { LayerCopyStore } from '../db/layer-copy-store';
import { layerKeysDistinct } from '../db/layer-keys';
import { layersScan, type LayerScanProgress } from './agreement-read';
import { layerCopiesFor } from './layer-copies';

export interface OverviewRequest {
  projectId: number;
  /** Whose labels the distribution counts: null = every person's layers (not gold or model). */
  source: string | null;
  /** Layer statuses the distribution counts. */
  statuses: LayerStatus[];
}

export interface AnnotatorProgress {
  annotator: string;
  statuses: Record<LayerStatus, number>;
  /** Per UTC day (ms at 00:00) with a change, the layers now `done` whose last change was on or before it. */
  doneByDay: { day: number; done: number }[];
}

export interface OverviewResult {
  utterances: number;
  /** Layers of people, gold and model, with their status counts. */
  annotators: AnnotatorProgress[];
  /** Every slot with a span in the counted layers, most spans first (ties by name). */
  slots: { slot: string; spans: number }[];
  /** Intents of the counted layers, most first; null intent as `(none)`. */
  intents: { intent: string; count: number }[];
  countedLayers: number;
  headline: {
    people: number;
    layers: number;
    doneLayers: number;
    /** Utterances with two or more people's layers done: where agreement can be measured. */
    overlapDone: number;
    goldLayers: number;
    /** Utterances without any person's layer. */
    untouched: number;
  };
}

export const INTENT_NONE = '(none)';
const DAY = 86_400_000;

function ranked<K extends string>(counts: Map<string, number>, key: K): ({ [P in K]: string } & { count: number })[] {
  return [...counts.entries()]
    .sort(([x, a], [y, b]) => b - a || (x < y ? -1 : x > y ? 1 : 0))
    .map(([name, count]) => ({ [key]: name, count }) as { [P in K]: string } & { count: number });
}

function statusesEmpty(): Record<LayerStatus, number> {
  return Object.fromEntries(LAYER_STATUSES.map((s) => [s, 0])) as Record<LayerStatus, number>;
}

/** The pass itself, over rows in utterance order (an utterance's layers together), as `layersScan` gives them. */
export class OverviewTally {
  private readonly slots = new Map<string, number>();
  private readonly intents = new Map<string, number>();
  private readonly progress = new Map<string, { statuses: Record<LayerStatus, number>; doneDays: Map<number, number> }>();
  private counted = 0;
  private layers = 0;
  private doneLayers = 0;
  private goldLayers = 0;
  private overlapDone = 0;
  private touched = 0;
  private current = -1;
  private currentDone = 0;
  private currentPeople = 0;

  constructor(private readonly request: Omit<OverviewRequest, 'projectId'>) {}

  private utteranceEnd(): void {
    if (this.currentDone >= 2) this.overlapDone++;
    if (this.currentPeople > 0) this.touched++;
    this.currentDone = 0;
    this.currentPeople = 0;
  }

  rowAdd(row: Pick<LayerRow, 'utteranceId' | 'annotator' | 'tags' | 'intent' | 'status' | 'updated'>): void {
    if (row.utteranceId !== this.current) {
      if (this.current >= 0) this.utteranceEnd();
      this.current = row.utteranceId;
    }
    const person = !ANNOTATORS_RESERVED.includes(row.annotator);
    this.layers++;
    if (row.annotator === 'gold') this.goldLayers++;
    if (person) {
      this.currentPeople++;
      if (row.status === 'done') {
        this.doneLayers++;
        this.currentDone++;
      }
    }
    let entry = this.progress.get(row.annotator);
    if (entry === undefined) {
      entry = { statuses: statusesEmpty(), doneDays: new Map() };
      this.progress.set(row.annotator, entry);
    }
    entry.statuses[row.status] += 1;
    if (row.status === 'done') {
      const day = Math.floor(row.updated / DAY) * DAY;
      entry.doneDays.set(day, (entry.doneDays.get(day) ?? 0) + 1);
    }
    const { source, statuses } = this.request;
    const chosen = source === null ? person : row.annotator === source;
    if (!chosen || !statuses.includes(row.status)) return;
    this.counted++;
    for (const span of spansFromTags(row.tags)) this.slots.set(span.slot, (this.slots.get(span.slot) ?? 0) + 1);
    const intent = row.intent ?? INTENT_NONE;
    this.intents.set(intent, (this.intents.get(intent) ?? 0) + 1);
  }

  done(utterances: number): OverviewResult {
    if (this.current >= 0) this.utteranceEnd();
    this.current = -1;
    const annotators = [...this.progress.entries()]
      .sort(([x], [y]) => (x < y ? -1 : x > y ? 1 : 0))
      .map(([annotator, entry]): AnnotatorProgress => {
        let running = 0;
        const doneByDay = [...entry.doneDays.entries()].sort(([x], [y]) => x - y).map(([day, n]) => ({ day, done: (running += n) }));
        return { annotator, statuses: entry.statuses, doneByDay };
      });
    const people = annotators.filter((a) => !ANNOTATORS_RESERVED.includes(a.annotator)).length;
    return {
      utterances,
      annotators,
      slots: ranked(this.slots, 'slot').map(({ slot, count }) => ({ slot, spans: count })),
      intents: ranked(this.intents, 'intent'),
      countedLayers: this.counted,
      headline: { people, layers: this.layers, doneLayers: this.doneLayers, overlapDone: this.overlapDone, goldLayers: this.goldLayers, untouched: utterances - this.touched },
    };
  }
}

/** `copies`: read the layers through their kept copies (see layer-copies.ts) instead of every row. */
export async function overviewRun(
  db: SlotsmithDb,
  request: OverviewRequest,
  onProgress: (p: LayerScanProgress) => void = () => {},
  copies?: LayerCopyStore,
): Promise<OverviewResult> {
  const tally = new OverviewTally(request);
  const { projectId } = request;
  if (copies === undefined) {
    await layersScan(db, { projectId, annotators: null, statuses: null }, (row) => tally.rowAdd(row), onProgress);
  } else {
    const signature = await corpusIndexSignature(db, projectId);
    const annotators = [...new Set((await layerKeysDistinct(db, projectId)).map(([, annotator]) => annotator))];
    const had = await layerCopiesFor(db, copies, projectId, annotators, signature, onProgress);
    layerCopiesVisit(had.copies, null, (row) => tally.rowAdd(row));
    // Before the result: the page ends this worker once it has it.
    await had.saved;
  }
  return tally.done(await utteranceCount(db, projectId));
}

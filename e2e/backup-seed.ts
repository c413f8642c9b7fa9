/**
 * Test data without the import screen: a project backup file built with the pure backup codec from
 * labelled utterances (e.g. a column file read with columnsRead), each given one annotator layer.
 */
import { backupEncode, type BackupData, type BackupLayer, type LayerStatus } from '../src/core/backup';
import type { Utterance } from '../src/core/types';

export interface BackupSeedOptions {
  projectName: string;
  annotator: string;
  /** Status of each utterance's layer; `done` when absent. */
  statusOf?: (u: Utterance, position: number) => LayerStatus;
  /** Milliseconds since the epoch for every time stamp. */
  time: number;
}

export function backupSeedData(utterances: readonly Utterance[], options: BackupSeedOptions): BackupData {
  const { time } = options;
  const layers: BackupLayer[] = utterances.map((u, i) => ({
    seq: i + 1,
    annotator: options.annotator,
    tags: [...u.tags],
    intent: u.intent ?? null,
    status: options.statusOf?.(u, i) ?? 'done',
    note: '',
    revision: 1,
    updated: time,
  }));
  return {
    project: { name: options.projectName, created: time, updated: time, tokeniser: { kind: 'words' }, scheme: 'iob2', schema: { slots: [], intents: [] } },
    annotators: [{ id: options.annotator, name: options.annotator, role: 'annotator' }],
    batches: [],
    utterances: utterances.map((u, i) => ({
      seq: i + 1,
      text: u.text,
      tokens: u.tokens.flatMap((t) => [t.start, t.end]),
      ...(u.id === undefined ? {} : { externalId: u.id }),
      meta: { ...u.meta },
    })),
    layers,
    history: [],
  };
}

export function backupSeed(utterances: readonly Utterance[], options: BackupSeedOptions): string {
  return backupEncode(backupSeedData(utterances, options), new Date(options.time).toISOString());
}

/** Test projects for the agreement worker: several annotators' layers on shared utterances, written straight to the database. */
import type { LayerStatus } from '../../src/core/backup/model';
import type { Utterance } from '../../src/core/types';
import { projectCreate } from '../../src/db/project-repo';
import type { LayerRow, SlotsmithDb, UtteranceRow } from '../../src/db/schema';
import { tokensPack } from '../../src/db/tokens';

export interface SeedLayer {
  annotator: string;
  utterances: readonly Utterance[];
  statusOf?: (u: Utterance, position: number) => LayerStatus;
  updatedOf?: (u: Utterance, position: number) => number;
}

/**
 * Utterances pair up by their file id, stored in first-seen order (the first layer's, then ids
 * new in later layers), as the import screen attaches a second annotator's file.
 */
export async function agreementSeed(db: SlotsmithDb, layers: readonly SeedLayer[], name = 'Boiler jobs'): Promise<{ projectId: number; idOf: Map<string, number> }> {
  const project = await projectCreate(db, { name });
  const projectId = project.id;
  const first = new Map<string, Utterance>();
  for (const layer of layers) for (const u of layer.utterances) if (!first.has(u.id ?? '')) first.set(u.id ?? '', u);
  const rows = [...first.values()].map(
    (u, i): Omit<UtteranceRow, 'id'> => ({ projectId, seq: i + 1, text: u.text, tokens: tokensPack(u.tokens), externalId: u.id ?? '', meta: {}, source: {} }),
  );
  const ids = (await db.utterances.bulkAdd(rows as UtteranceRow[], { allKeys: true })) as number[];
  const idOf = new Map([...first.keys()].map((id, i) => [id, ids[i] as number]));
  for (const layer of layers) {
    await db.annotators.put({ projectId, id: layer.annotator, name: layer.annotator, role: 'annotator' });
    const layerRows = layer.utterances.map(
      (u, i): LayerRow => ({
        utteranceId: idOf.get(u.id ?? '') as number,
        annotator: layer.annotator,
        projectId,
        tags: [...u.tags],
        intent: u.intent ?? null,
        status: layer.statusOf?.(u, i) ?? 'done',
        note: '',
        revision: 1,
        updated: layer.updatedOf?.(u, i) ?? Date.UTC(2025, 2, 14),
      }),
    );
    await db.layers.bulkAdd(layerRows);
  }
  return { projectId, idOf };
}

/** What the label screen reads: the project, the utterance in the URL, its layers, and its position. */
import Dexie from 'dexie';
import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useMemo } from 'react';
import { tokensUnpack } from '../../../db/tokens';
import { labelNextUncertain, labelNextUnlabelled, labelUncertainOrder } from '../../../db/label-nav';
import { projectGet } from '../../../db/project-repo';
import type { LayerRow, ProjectRow, UtteranceRow } from '../../../db/schema';
import { useNav } from '../../../state/nav';
import { appDb } from '../../app/db';
import type { Token } from '../../../core/types';

export interface LabelData {
  project: ProjectRow | null | undefined;
  /** undefined while loading, null when the URL names none (or one of another project). */
  utterance: UtteranceRow | null | undefined;
  tokens: readonly Token[];
  /** Every layer of the utterance, live (other tabs' saves included). */
  layers: readonly LayerRow[] | undefined;
  /** 1-based position in the project, and the number of utterances. */
  position: number | undefined;
  total: number | undefined;
}

export function useLabelData(projectId: number, layerName: string): LabelData {
  const { query, queryReplace } = useNav();
  const wanted = query.u === undefined ? null : Number(query.u);
  const uncertain = query.order === 'uncertain';
  const db = appDb();
  const project = useLiveQuery(async () => (await projectGet(db, projectId)) ?? null, [projectId]);
  const utterance = useLiveQuery(async () => {
    if (wanted === null || !Number.isSafeInteger(wanted)) return null;
    const row = await db.utterances.get(wanted);
    return row?.projectId === projectId ? row : null;
  }, [wanted, projectId]);
  const id = utterance?.id ?? -1;
  const layers = useLiveQuery(() => db.layers.where('[utteranceId+annotator]').between([id, Dexie.minKey], [id, Dexie.maxKey]).toArray(), [id]);
  const seq = utterance?.seq;
  const position = useLiveQuery(
    async () => (seq === undefined ? undefined : (await db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, seq], true, true).count())),
    [projectId, seq],
  );
  const total = useLiveQuery(() => db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).count(), [projectId]);
  const tokens = useMemo(() => (utterance ? tokensUnpack(utterance.tokens) : []), [utterance]);

  // No utterance in the URL: open the first one this layer has not started, in the chosen order (else the first of all).
  useEffect(() => {
    if (wanted !== null) return;
    let live = true;
    void (async () => {
      const first = uncertain ? await labelNextUncertain(db, projectId, layerName, await labelUncertainOrder(db, projectId), null) : await labelNextUnlabelled(db, projectId, layerName, null);
      const next = first ?? (await db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).first());
      if (live && next !== undefined) queryReplace({ ...useNav.getState().query, u: String(next.id) });
    })();
    return () => {
      live = false;
    };
  }, [wanted, projectId, layerName, db, queryReplace, uncertain]);

  return { project, utterance, tokens, layers, position, total };
}

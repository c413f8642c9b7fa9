/** The model's suggestions for the shown utterance, minus what the labeller labelled or rejected, and their actions. */
import { useCallback, useEffect, useMemo, useRef, useSyncExternalStore } from 'react';
import type { SlotDef } from '../../../core/backup/model';
import type { TokenSelection } from '../../../core/editing';
import type { Token } from '../../../core/types';
import type { LabelEditor } from './label-editor';
import { suggestionRejectsFor } from './suggestion-rejects';
import { suggestionAcceptOp, suggestionName, suggestionsFor, suggestionsRejectedCount, type Suggestion } from './suggestions';

const NONE: ReadonlySet<string> = new Set();

export interface SuggestionInput {
  dbName: string;
  projectId: number;
  layerName: string;
  editor: LabelEditor;
  /** The shown utterance (null while none). */
  utterance: { id: number; text: string } | null;
  tokens: readonly Token[];
  modelTags: readonly string[] | undefined;
  /** The labeller's layer as shown; undefined while it loads. */
  ownTags: readonly string[] | undefined;
  slots: readonly SlotDef[];
  /** False while a conflict prompt waits: no edit may be queued then. */
  editable: boolean;
  select: (selection: TokenSelection) => void;
  say: (words: string) => void;
}

export interface SuggestionState {
  /** True when the utterance has a model layer at all. */
  offered: boolean;
  suggestions: readonly Suggestion[];
  hidden: number;
  /** Accept through the ordinary edit path (one save and one undo step for several). */
  accept: (list: readonly Suggestion[]) => void;
  reject: (list: readonly Suggestion[]) => void;
  /** Stable callbacks for the memoised list. */
  acceptOne: (s: Suggestion) => void;
  rejectOne: (s: Suggestion) => void;
  acceptAll: () => void;
  rejectAll: () => void;
  restore: () => void;
}

/**
 * Worked out once per change of the model layer, the shown tags or the rejections, never per key
 * press: selection moves leave every input the same, so the memos hold.
 */
export function useSuggestions(input: SuggestionInput): SuggestionState {
  const { dbName, projectId, layerName, utterance, modelTags, ownTags, slots } = input;
  const utteranceId = utterance?.id ?? null;
  const rejects = useMemo(() => suggestionRejectsFor(dbName, projectId, layerName), [dbName, projectId, layerName]);
  const rejected = useSyncExternalStore(rejects.subscribe, () => (utteranceId === null ? NONE : rejects.rejected(utteranceId)));
  useEffect(() => {
    const listener = (event: StorageEvent) => rejects.storageChanged(event.key);
    window.addEventListener('storage', listener);
    return () => window.removeEventListener('storage', listener);
  }, [rejects]);
  const known = useMemo(() => (slots.length === 0 ? null : new Set(slots.map((s) => s.name))), [slots]);
  const suggestions = useMemo(() => (ownTags === undefined ? [] : suggestionsFor(modelTags, ownTags, rejected, known)), [modelTags, ownTags, rejected, known]);
  const hidden = useMemo(() => (ownTags === undefined ? 0 : suggestionsRejectedCount(modelTags, ownTags, rejected, known)), [modelTags, ownTags, rejected, known]);

  const latest = useRef(input);
  useEffect(() => {
    latest.current = input;
  });
  const accept = useCallback((list: readonly Suggestion[]) => {
    const { editor, utterance: u, tokens, ownTags: own, editable, select, say } = latest.current;
    if (u === null || own === undefined || !editable || list.length === 0) return;
    editor.editAll(list.map(suggestionAcceptOp));
    const only = list.length === 1 ? list[0] : undefined;
    if (only !== undefined) select({ anchor: only.start, focus: only.end - 1 });
    say(only !== undefined ? `Accepted suggestion ${suggestionName(u.text, tokens, only)}.` : `Accepted ${list.length} suggestions.`);
  }, []);
  const reject = useCallback(
    (list: readonly Suggestion[]) => {
      const { utterance: u, tokens, say } = latest.current;
      if (u === null || list.length === 0) return;
      rejects.reject(u.id, list.map((s) => s.key));
      const only = list.length === 1 ? list[0] : undefined;
      say(only !== undefined ? `Rejected suggestion ${suggestionName(u.text, tokens, only)}.` : `Rejected ${list.length} suggestions.`);
    },
    [rejects],
  );
  const acceptOne = useCallback((s: Suggestion) => accept([s]), [accept]);
  const rejectOne = useCallback((s: Suggestion) => reject([s]), [reject]);
  const acceptAll = useCallback(() => accept(suggestions), [accept, suggestions]);
  const rejectAll = useCallback(() => reject(suggestions), [reject, suggestions]);
  const restore = useCallback(() => {
    if (utteranceId !== null) rejects.restore(utteranceId);
  }, [rejects, utteranceId]);
  return { offered: modelTags !== undefined, suggestions, hidden, accept, reject, acceptOne, rejectOne, acceptAll, rejectAll, restore };
}

/** The text and tokens of the utterance a conflict prompt is about (it may not be the one shown). */
import { useEffect, useState } from 'react';
import { tokensUnpack } from '../../../db/tokens';
import { appDb } from '../../app/db';

export function useConflictUtterance(id: number | null): { text: string; tokens: { start: number; end: number }[] } | null {
  const [value, setValue] = useState<{ id: number; text: string; tokens: { start: number; end: number }[] } | null>(null);
  useEffect(() => {
    if (id === null) return;
    let live = true;
    void appDb()
      .utterances.get(id)
      .then((u) => live && u !== undefined && setValue({ id, text: u.text, tokens: tokensUnpack(u.tokens) }));
    return () => {
      live = false;
    };
  }, [id]);
  return value !== null && value.id === id ? value : null;
}

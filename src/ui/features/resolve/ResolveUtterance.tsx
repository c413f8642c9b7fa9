import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useLayoutEffect, useRef, useState } from 'react';
import { goldTags, type Side } from '../../../core/adjudication';
import { ANNOTATOR_GOLD } from '../../../core/backup/model';
import { layerSave, RevisionConflictError, tokensUnpack, type LayerRow, type ProjectRow } from '../../../db';
import { disagreementStep } from '../../../db/adjudication-repo';
import { appDb } from '../../app/db';
import { DisagreementList } from './DisagreementList';
import { EditPanel } from './EditPanel';
import { resolveCommandOf, type ResolveCommand } from './resolve-keys';
import { decisionEdit, decisionIntent, decisionTake, decisionTakeAll, itemNextOpen, resolveModel, tokenRegions, type GoldChange } from './resolve-model';
import { TokenGrid } from './TokenGrid';

interface Props {
  projectId: number;
  project: ProjectRow;
  utteranceId: number;
  a: string;
  b: string;
  /** The adjudicator's id, or null when this screen is read-only. */
  who: string | null;
  enterAt: 'first' | 'last';
  onOpen: (utteranceId: number, at: 'first' | 'last') => void;
}

function typing(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  return target.isContentEditable || ['INPUT', 'SELECT', 'TEXTAREA'].includes(target.tagName);
}

/** One utterance: the grid, its disagreements, and the decisions that write gold. */
export function ResolveUtterance({ projectId, project, utteranceId, a, b, who, enterAt, onOpen }: Props) {
  const db = appDb();
  const data = useLiveQuery(async () => {
    const [utterance, layers] = await Promise.all([db.utterances.get(utteranceId), db.layers.bulkGet([[utteranceId, a], [utteranceId, b], [utteranceId, ANNOTATOR_GOLD]])]);
    return { utterance: utterance ?? null, la: layers[0], lb: layers[1], gold: layers[2] };
  }, [utteranceId, a, b]);
  // The row a save returned, until the live query catches up with it: a quick second key press must build on it.
  const [saved, setSaved] = useState<LayerRow | null>(null);
  const [focus, setFocus] = useState<number | null>(null);
  const [reason, setReason] = useState('');
  const [message, setMessage] = useState<{ text: string; error: boolean } | null>(null);
  const [busy, setBusy] = useState(false);
  const [selection, setSelection] = useState<{ anchor: number; focus: number } | null>(null);
  const reasonRef = useRef<HTMLInputElement>(null);
  const saving = useRef(false);

  const stored = data?.gold;
  const gold = saved !== null && saved.revision > (stored?.revision ?? 0) ? saved : stored;
  const words = data?.utterance ? tokensUnpack(data.utterance.tokens).map((t) => (data.utterance as { text: string }).text.slice(t.start, t.end)) : [];
  const model =
    data?.la !== undefined && data.lb !== undefined
      ? resolveModel({ length: words.length, scheme: project.scheme, a: data.la, b: data.lb, gold, names: { a, b } })
      : null;
  const items = model?.items ?? [];
  const current = focus === null ? (enterAt === 'last' ? Math.max(0, items.length - 1) : Math.max(0, itemNextOpen(items, -1))) : focus;
  const currentItem = items[current];

  async function save(change: GoldChange, what: string, nextFocus: number | null) {
    if (who === null || model === null) return;
    // A ref, not state: two quick key presses in one frame must not both save on the same revision.
    if (saving.current) {
      setMessage({ text: 'Still saving the previous decision; press again in a moment.', error: true });
      return;
    }
    saving.current = true;
    setBusy(true);
    try {
      const row = await layerSave(db, [utteranceId, ANNOTATOR_GOLD], change, { expectedRevision: model.revision, who });
      setSaved(row);
      setReason('');
      setMessage({ text: `Saved to gold: ${what}.`, error: false });
      if (nextFocus !== null) setFocus(nextFocus);
    } catch (error) {
      const text =
        error instanceof RevisionConflictError
          ? 'The gold layer of this utterance was changed elsewhere (another tab?). The screen now shows the stored version; make that choice again if it still applies.'
          : `Not saved: ${(error as Error).message}`;
      setSaved(null);
      setMessage({ text, error: true });
    } finally {
      saving.current = false;
      setBusy(false);
    }
  }

  async function step(direction: 1 | -1) {
    const next = current + direction;
    if (next >= 0 && next < items.length) {
      setFocus(next);
      return;
    }
    // Still loading this utterance: stepping from nowhere would jump to the first or last one.
    const seq = data?.utterance?.seq;
    if (seq === undefined) return;
    const found = await disagreementStep(db, projectId, a, b, seq, direction);
    if (found === undefined) setMessage({ text: direction === 1 ? 'That was the last disagreement.' : 'That was the first disagreement.', error: false });
    else onOpen(found.utteranceId, direction === 1 ? 'first' : 'last');
  }

  function take(side: Side, index = current) {
    const item = items[index];
    if (model === null || item === undefined) return;
    const change = decisionTake(model, item, side, reason);
    const after = items.map((i, k) => (k === index ? { ...i, decided: true } : i));
    const next = itemNextOpen(after, index);
    void save(change, `took ${side === 'a' ? a : b} for ${item.kind === 'intent' ? 'the intent' : item.key}`, next < 0 ? index : next);
  }

  function command(c: ResolveCommand) {
    if (c.kind === 'step') void step(c.direction);
    else if (c.kind === 'nextOpenUtterance') {
      if (data?.utterance === undefined || data.utterance === null) return;
      void disagreementStep(db, projectId, a, b, data.utterance.seq, 1, { unresolvedOnly: true }).then((found) => {
        if (found === undefined) setMessage({ text: 'No unresolved utterance after this one.', error: false });
        else onOpen(found.utteranceId, 'first');
      });
    } else if (c.kind === 'reasonFocus') reasonRef.current?.focus();
    else if (who === null) setMessage({ text: 'Read-only: only an adjudicator writes gold.', error: true });
    else if (c.kind === 'take') take(c.side);
    else if (model !== null) void save(decisionTakeAll(model, c.side, reason), `took ${c.side === 'a' ? a : b} for the whole utterance`, null);
  }

  // Keys are heard on the whole window; the listener always calls this render's handler.
  const commandLatest = useRef(command);
  // Before paint, not after: a key pressed as soon as this utterance shows must see its data.
  useLayoutEffect(() => {
    commandLatest.current = command;
  });
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (typing(event.target) || event.repeat) return;
      const c = resolveCommandOf({ key: event.key, shift: event.shiftKey, ctrl: event.ctrlKey, alt: event.altKey, meta: event.metaKey });
      if (c === null) return;
      event.preventDefault();
      commandLatest.current(c);
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  if (data === undefined) return <p>Loading…</p>;
  if (data.utterance === null) return <p role="alert">This utterance does not exist (it may have been deleted).</p>;
  if (model === null) return <p>{a} and {b} do not both have a layer on this utterance.</p>;

  const regionOf = tokenRegions(model.diff);
  const goldNow = goldTags(model.spans, words.length, project.scheme);
  const range = selection === null ? null : { from: Math.min(selection.anchor, selection.focus), to: Math.max(selection.anchor, selection.focus) };
  const regionCurrent = currentItem?.kind === 'region' ? model.diff.regions.indexOf(currentItem.region as (typeof model.diff.regions)[number]) + 1 : 0;

  return (
    <article aria-labelledby="resolve-utterance-title" className="resolve-utterance">
      <h3 id="resolve-utterance-title">
        Utterance {data.utterance.seq}
        {data.utterance.externalId === undefined ? '' : ` (${data.utterance.externalId})`}
      </h3>
      <p className="resolve-text">{data.utterance.text}</p>
      <p>
        {items.length === 0
          ? `${a} and ${b} agree here.`
          : `${model.decided} of ${items.length} disagreement${items.length === 1 ? '' : 's'} settled here.`}{' '}
        Gold layer: {gold === undefined ? 'not started' : `${gold.status}, revision ${gold.revision}`}.
      </p>
      <TokenGrid
        words={words}
        rows={[
          { label: `A: ${a}`, tags: data.la?.tags ?? [] },
          { label: `B: ${b}`, tags: data.lb?.tags ?? [] },
          { label: gold === undefined ? 'Gold (not saved yet)' : 'Gold', tags: goldNow },
        ]}
        diff={model.diff}
        regionOf={regionOf}
        current={regionCurrent}
        selection={range}
        onToken={who === null ? null : (i, extend) => setSelection((s) => (extend && s !== null ? { anchor: s.anchor, focus: i } : { anchor: i, focus: i }))}
      />
      <table className="resolve-intents">
        <caption>Intent</caption>
        <tbody>
          <tr>
            <th scope="row">A: {a}</th>
            <td>{data.la?.intent ?? 'none'}</td>
            <th scope="row">B: {b}</th>
            <td>{data.lb?.intent ?? 'none'}</td>
            <th scope="row">Gold</th>
            <td>{model.intent ?? 'none'}</td>
            <td>{model.intentDiffers ? 'differs' : 'same'}</td>
          </tr>
        </tbody>
      </table>
      <DisagreementList
        model={model}
        words={words}
        current={current}
        names={{ a, b }}
        disabled={who === null || busy}
        onFocus={setFocus}
        onTake={(index, side) => take(side, index)}
      />
      {who !== null && (
        <>
          <label className="resolve-reason">
            Reason for the next decision (optional){' '}
            <input ref={reasonRef} value={reason} onChange={(e) => setReason(e.target.value)} onKeyDown={(e) => e.key === 'Escape' && e.currentTarget.blur()} />
          </label>
          <p className="muted">Decisions and their reasons are kept as lines of the gold layer&apos;s note, and every save is a history entry with who and when.</p>
          <EditPanel
            schema={project.schema}
            range={range}
            intent={model.intent}
            disabled={busy}
            onLabel={(slot) => range !== null && void save(decisionEdit(model, range.from, range.to + 1, slot, reason), slot === null ? `cleared tokens ${range.from + 1}-${range.to + 1}` : `labelled tokens ${range.from + 1}-${range.to + 1} as ${slot}`, null)}
            onIntent={(intent) => void save(decisionIntent(model, intent, reason), `set the intent to ${intent ?? 'none'}`, null)}
          />
        </>
      )}
      <div aria-live="polite">{message !== null && <p className={message.error ? 'error' : 'resolve-saved'}>{message.text}</p>}</div>
      {model.note !== '' && (
        <details className="resolve-note">
          <summary>Decisions so far (gold note)</summary>
          <pre>{model.note}</pre>
        </details>
      )}
    </article>
  );
}

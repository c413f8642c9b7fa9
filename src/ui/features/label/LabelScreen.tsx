import { useLiveQuery } from 'dexie-react-hooks';
import { useCallback, useEffect, useMemo, useRef, useState, useSyncExternalStore } from 'react';
import { ANNOTATOR_GOLD, ANNOTATOR_MODEL } from '../../../core/backup/model';
import { selectionCaret, selectionClamp, selectionMove, selectionTarget, tagsNeedLegalising, type EditOp, type TokenSelection } from '../../../core/editing';
import { labelNextUncertain, labelNextUnlabelled, labelUncertainOrder, labelUtteranceStep } from '../../../db/label-nav';
import type { LayerKey } from '../../../db/schema';
import { tokensCount } from '../../../db/tokens';
import { useNav } from '../../../state/nav';
import { useSession, type Profile } from '../../../state/session';
import { appDb } from '../../app/db';
import { ConflictPrompt } from './ConflictPrompt';
import { HelpOverlay } from './HelpOverlay';
import { LabelWho } from './LabelWho';
import { LayerFields } from './LayerFields';
import { OrderChoice } from './OrderChoice';
import { OtherLayers } from './OtherLayers';
import { SlotLegend } from './SlotLegend';
import { SlotSearch } from './SlotSearch';
import { SuggestionPanel } from './SuggestionPanel';
import { TokenStrip } from './TokenStrip';
import { labelEditorFor } from './label-editor';
import { labelCommandFor, type LabelCommand } from './label-keys';
import { selectedText } from './label-text';
import { suggestionAtSelection } from './suggestions';
import { useConflictUtterance } from './use-conflict-utterance';
import { useLabelData } from './use-label-data';
import { useSuggestions } from './use-suggestions';

type Panel = 'none' | 'help' | 'slots';

function typingTarget(el: Element): boolean {
  return el.tagName === 'INPUT' || el.tagName === 'TEXTAREA' || el.tagName === 'SELECT' || (el instanceof HTMLElement && el.isContentEditable) || el.closest('dialog') !== null;
}

/** The span editor for one person in one project. */
export function LabelScreen({ projectId, profile }: { projectId: number; profile: Profile }) {
  const db = appDb();
  const { query, go, queryReplace } = useNav();
  const blind = useSession((s) => s.blind);
  const blindSet = useSession((s) => s.blindSet);
  const adjudicator = profile.role === 'adjudicator';
  const layerName = adjudicator && query.layer === ANNOTATOR_GOLD ? ANNOTATOR_GOLD : profile.id;
  const data = useLabelData(projectId, layerName);
  const { project, utterance, tokens, layers } = data;
  const editor = useMemo(() => labelEditorFor(db, projectId, profile.id), [db, projectId, profile.id]);
  const view = useSyncExternalStore(editor.subscribe, editor.snapshot);
  const [selectionState, setSelectionState] = useState<{ id: number | null; selection: TokenSelection }>({ id: null, selection: selectionCaret(0) });
  const [panel, setPanel] = useState<Panel>('none');
  const [said, setSaid] = useState('');
  const strip = useRef<HTMLDivElement>(null);
  const intentRef = useRef<HTMLSelectElement>(null);
  const noteRef = useRef<HTMLTextAreaElement>(null);

  const utteranceId = utterance?.id ?? null;
  // The selection belongs to one utterance: another one starts at its first token.
  const selection = selectionState.id === utteranceId ? selectionState.selection : selectionCaret(0);
  const setSelection = useCallback(
    (next: TokenSelection | ((s: TokenSelection) => TokenSelection)) =>
      setSelectionState((prev) => {
        const current = prev.id === utteranceId ? prev.selection : selectionCaret(0);
        return { id: utteranceId, selection: typeof next === 'function' ? next(current) : next };
      }),
    [utteranceId],
  );
  const key: LayerKey | null = utteranceId === null ? null : [utteranceId, layerName];
  const shown = view.key !== null && key !== null && view.key[0] === key[0] && view.key[1] === key[1] ? view.edit : null;
  const slots = useMemo(() => project?.schema.slots ?? [], [project]);
  const modelRow = layers?.find((l) => l.annotator === ANNOTATOR_MODEL);
  const suggested = useSuggestions({
    dbName: db.name,
    projectId,
    layerName,
    editor,
    utterance: utterance ?? null,
    tokens,
    modelTags: modelRow?.tags,
    ownTags: shown?.tags,
    slots,
    editable: view.conflict === null,
    select: setSelection,
    say: setSaid,
  });
  const list = suggested.suggestions;
  // "Least sure first": the model's order, kept fresh by a live query that only model-layer writes wake.
  const uncertain = query.order === 'uncertain';
  const uncertainOrder = useLiveQuery(async () => (uncertain ? labelUncertainOrder(db, projectId) : null), [db, projectId, uncertain]);

  const goTo = useCallback((id: number) => go('label', projectId, { ...useNav.getState().query, u: String(id) }), [go, projectId]);
  useEffect(() => {
    editor.navigateSet(goTo);
  }, [editor, goTo]);

  useEffect(() => {
    void editor.undoSeed(projectId, adjudicator ? [profile.id, ANNOTATOR_GOLD] : [profile.id]);
  }, [editor, projectId, profile.id, adjudicator]);

  // A newly shown layer: read it once from the database (a live query may lag behind this tab's own save).
  useEffect(() => {
    if (utterance === null || utterance === undefined) return;
    let live = true;
    void db.layers.get([utterance.id, layerName]).then((row) => {
      if (!live) return;
      editor.open([utterance.id, layerName], row, tokensCount(utterance.tokens));
      setSelection((s) => selectionClamp(s, tokensCount(utterance.tokens)));
    });
    return () => {
      live = false;
    };
  }, [db, editor, utterance, layerName, setSelection]);

  const ownRow = layers?.find((l) => l.annotator === layerName);
  useEffect(() => {
    if (key !== null) editor.storedSeen(key, ownRow);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- `key` is rebuilt each render; its parts are listed.
  }, [editor, ownRow, utteranceId, layerName]);

  const edit = useCallback(
    (op: EditOp) => {
      editor.edit(op);
    },
    [editor],
  );

  function labelWith(slot: string) {
    if (shown === null) return;
    const target = selectionTarget(shown.tags, selection);
    if (target === null) return;
    edit({ kind: 'label', from: target.from, to: target.to, slot });
    setSelection({ anchor: target.from, focus: target.to });
    const first = tokens[target.from];
    const last = tokens[target.to];
    if (utterance && first && last) setSaid(`Labelled “${utterance.text.slice(first.start, last.end)}” as ${slot}.`);
  }

  // A stable callback for the memoised slot buttons, always calling this render's labelWith.
  const labelWithLatest = useRef(labelWith);
  useEffect(() => {
    labelWithLatest.current = labelWith;
  });
  const pick = useCallback((slot: string) => labelWithLatest.current(slot), []);

  // Steps run one after another and start from the utterance in the URL, not the one on screen:
  // keys pressed while the next utterance is still loading must count from where the last step went.
  const stepping = useRef<Promise<void>>(Promise.resolve());
  function step(to: 'next' | 'previous' | 'nextUnlabelled'): Promise<void> {
    if (!utterance) return Promise.resolve();
    const run = async () => {
      const current = Number(useNav.getState().query.u);
      const from = Number.isSafeInteger(current) ? ((await db.utterances.get(current)) ?? utterance) : utterance;
      const byUncertainty = to === 'nextUnlabelled' && useNav.getState().query.order === 'uncertain';
      const next = byUncertainty
        ? await labelNextUncertain(db, projectId, layerName, uncertainOrder ?? (await labelUncertainOrder(db, projectId)), from)
        : to === 'nextUnlabelled'
          ? await labelNextUnlabelled(db, projectId, layerName, from.seq)
          : await labelUtteranceStep(db, projectId, from.seq, to === 'next' ? 1 : -1);
      if (next === undefined) {
        setSaid(to === 'nextUnlabelled' ? 'Every utterance has been started in this layer.' : to === 'next' ? 'This is the last utterance.' : 'This is the first utterance.');
        return;
      }
      setSaid('');
      goTo(next.id);
    };
    stepping.current = stepping.current.then(run, run);
    return stepping.current;
  }

  const orderChange = useCallback((next: boolean) => queryReplace({ ...useNav.getState().query, order: next ? 'uncertain' : '' }), [queryReplace]);

  function run(command: LabelCommand) {
    const length = tokens.length;
    switch (command.kind) {
      case 'move':
        setSelection((s) => selectionMove(s, command.delta, length, command.extend));
        break;
      case 'edge': {
        const to = command.to === 'first' ? 0 : Math.max(0, length - 1);
        setSelection((s) => (command.extend ? { anchor: s.anchor, focus: to } : selectionCaret(to)));
        break;
      }
      case 'label':
        labelWith(command.slot);
        break;
      case 'remove': {
        const target = shown === null ? null : selectionTarget(shown.tags, selection);
        if (target !== null) edit({ kind: 'remove', from: target.from, to: target.to });
        break;
      }
      case 'collapse':
        setSelection((s) => selectionCaret(s.focus));
        break;
      case 'slotSearch':
        setPanel('slots');
        break;
      case 'help':
        setPanel('help');
        break;
      case 'utterance':
        void step(command.to);
        break;
      case 'status':
        edit({ kind: 'status', status: command.status });
        setSaid(`Marked ${command.status}.`);
        break;
      case 'intentFocus':
        intentRef.current?.focus();
        break;
      case 'noteFocus':
        noteRef.current?.focus();
        break;
      case 'suggestion': {
        const one = command.all ? null : suggestionAtSelection(list, selection, length);
        const chosen = command.all ? list : one === null ? [] : [one];
        if (chosen.length === 0) setSaid('No model suggestion to act on here.');
        else if (command.act === 'accept') suggested.accept(chosen);
        else suggested.reject(chosen);
        break;
      }
      case 'undo':
        editor.undo();
        break;
      case 'redo':
        editor.redo();
        break;
    }
  }

  function keyDown(event: KeyboardEvent) {
    if (event.defaultPrevented || panel !== 'none' || view.conflict !== null || (event.target instanceof Element && typingTarget(event.target))) return;
    const command = labelCommandFor({ key: event.key, shift: event.shiftKey, ctrl: event.ctrlKey, alt: event.altKey, meta: event.metaKey }, slots);
    if (command === null) return;
    const onButton = event.target instanceof HTMLElement && event.target.tagName === 'BUTTON';
    // Arrows on a focused button stay with the button's own group; slot keys and Delete act on the tokens.
    if ((command.kind === 'move' || command.kind === 'edge') && onButton) return;
    if (command.kind === 'move' || command.kind === 'edge' || command.kind === 'label' || command.kind === 'remove') strip.current?.focus();
    event.preventDefault();
    run(command);
  }

  // Keys are heard on the whole window, so they keep working while the next utterance loads.
  const keyHandler = useRef(keyDown);
  useEffect(() => {
    keyHandler.current = keyDown;
  });
  useEffect(() => {
    const listener = (event: KeyboardEvent) => keyHandler.current(event);
    window.addEventListener('keydown', listener);
    return () => window.removeEventListener('keydown', listener);
  }, []);

  // Keyboard-first: a shown utterance takes the focus unless the user is somewhere else on purpose.
  const ready = shown !== null;
  useEffect(() => {
    if (!ready) return;
    const active = document.activeElement;
    if (active === null || active === document.body) strip.current?.focus();
  }, [ready, utteranceId]);

  const others = useMemo(() => (layers ?? []).filter((l) => l.annotator !== layerName), [layers, layerName]);
  const intents = useMemo(() => project?.schema.intents ?? [], [project]);
  const conflictUtterance = useConflictUtterance(view.conflict?.key[0] ?? null);

  if (project === null) return <p role="alert">This project does not exist (it may have been deleted in another tab).</p>;
  const title = `Label${project ? `: ${project.name}` : ''}`;

  return (
    <section aria-labelledby="label-title" className="label-screen">
      <h2 id="label-title">{title}</h2>
      <div className="label-bar">
        <p className="label-where">
          {utterance ? (
            <>
              Utterance {data.position?.toLocaleString('en') ?? '…'} of {data.total?.toLocaleString('en') ?? '…'}
              {utterance.externalId !== undefined && <span className="muted"> · id {utterance.externalId}</span>}
            </>
          ) : utterance === null && data.total === 0 ? (
            'This project has no utterances yet: bring some in first.'
          ) : (
            'Loading…'
          )}
        </p>
        <div className="label-actions" role="group" aria-label="Move between utterances">
          <button type="button" onClick={() => void step('previous')} disabled={!utterance} aria-keyshortcuts="[">
            Previous
          </button>
          <button type="button" onClick={() => void step('next')} disabled={!utterance} aria-keyshortcuts="]">
            Next
          </button>
          <button type="button" onClick={() => void step('nextUnlabelled')} disabled={!utterance} aria-keyshortcuts="Shift+N">
            Next not started
          </button>
        </div>
        <div className="label-actions" role="group" aria-label="Undo and help">
          <button type="button" onClick={() => editor.undo()} disabled={!view.canUndo} aria-keyshortcuts="Control+Z">
            Undo
          </button>
          <button type="button" onClick={() => editor.redo()} disabled={!view.canRedo} aria-keyshortcuts="Control+Shift+Z">
            Redo
          </button>
          <button type="button" onClick={() => setPanel('help')} aria-keyshortcuts="?">
            Keys (?)
          </button>
        </div>
      </div>
      <LabelWho
        name={profile.name}
        layerName={layerName}
        adjudicator={adjudicator}
        blind={blind}
        onGold={(gold) => go('label', projectId, { ...query, layer: gold ? ANNOTATOR_GOLD : '' })}
        onBlind={blindSet}
      />
      <OrderChoice uncertain={uncertain} scored={uncertainOrder?.ids.length} onChange={orderChange} />

      {view.newer !== null && shown !== null && (
        <p role="status" className="label-notice">
          This utterance was changed in another tab or window (now revision {view.newer.revision}).{' '}
          <button type="button" onClick={() => editor.newerTake()}>
            Show the newer version
          </button>
        </p>
      )}
      {utterance && shown !== null && tagsNeedLegalising(shown.tags) && (
        <p className="label-notice">
          The stored tags of this layer break the IOB2 rules; they are shown as the CoNLL-2000 evaluation reads them, and your next edit stores them as legal IOB2.
        </p>
      )}

      {utterance && shown !== null ? (
        <>
          <TokenStrip
            ref={strip}
            text={utterance.text}
            tokens={tokens}
            tags={shown.tags}
            slots={slots}
            selection={selection}
            onSelect={setSelection}
            label={`Tokens of the utterance. Selected: ${selectedText(utterance.text, tokens, selection)}`}
            idPrefix="label"
            suggestions={list}
          />
          {suggested.offered && (
            <SuggestionPanel
              suggestions={list}
              hidden={suggested.hidden}
              text={utterance.text}
              tokens={tokens}
              blind={blind}
              disabled={view.conflict !== null}
              onAccept={suggested.acceptOne}
              onReject={suggested.rejectOne}
              onAcceptAll={suggested.acceptAll}
              onRejectAll={suggested.rejectAll}
              onRestore={suggested.restore}
            />
          )}
          <SlotLegend slots={slots} onPick={pick} disabled={view.conflict !== null} />
          <LayerFields ref={intentRef} noteRef={noteRef} edit={shown} layerId={`${utterance.id}|${layerName}`} intents={intents} onEdit={edit} />
          <OtherLayers layers={others} blind={blind} text={utterance.text} tokens={tokens} slots={slots} />
        </>
      ) : (
        utterance !== null && <p>Loading…</p>
      )}

      <p role="status" className="label-saved">
        {view.error ?? (view.conflict !== null ? 'Waiting for your choice about the other version.' : view.saving ? 'Saving…' : view.revision > 0 ? `Saved (revision ${view.revision}).` : '')}
      </p>
      <p role="status" className="label-sr-only">
        {said}
      </p>

      <HelpOverlay open={panel === 'help'} slots={slots} onClose={() => setPanel('none')} />
      <SlotSearch
        open={panel === 'slots'}
        slots={slots}
        onClose={() => setPanel('none')}
        onPick={(slot) => {
          setPanel('none');
          labelWith(slot);
        }}
      />
      <ConflictPrompt
        conflict={view.conflict}
        text={conflictUtterance?.text ?? ''}
        tokens={conflictUtterance?.tokens ?? []}
        onKeepTheirs={() => editor.conflictKeepTheirs()}
        onApplyMine={() => editor.conflictApplyMine()}
      />
    </section>
  );
}

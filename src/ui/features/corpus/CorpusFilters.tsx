import { useEffect, useRef, useState } from 'react';
import { LAYER_STATUSES, type LayerStatus } from '../../../core/backup/model';
import type { CorpusFilter } from '../../../db/corpus-query';

export interface CorpusFiltersProps {
  filter: CorpusFilter;
  slots: readonly string[];
  intents: readonly string[];
  annotators: readonly string[];
  /** The layer shown, and the choice of it (null: blind mode, no choice). */
  layer: string | null;
  onLayer: ((layer: string) => void) | null;
  blind: boolean;
  onFilter: (filter: CorpusFilter) => void;
}

/** Typing is not navigation: the text goes to the URL once the typing pauses. */
const TYPING_PAUSE_MS = 250;

function without<K extends keyof CorpusFilter>(filter: CorpusFilter, key: K, value: CorpusFilter[K] | undefined): CorpusFilter {
  const next = { ...filter };
  if (value === undefined || value === '' || value === false) delete next[key];
  else next[key] = value;
  return next;
}

interface ChoiceProps {
  id: string;
  label: string;
  value: string | undefined;
  options: readonly string[];
  anyLabel: string;
  onChange: (value: string | undefined) => void;
}

function Choice({ id, label, value, options, anyLabel, onChange }: ChoiceProps) {
  // A value from a shared link that this project lacks stays selectable, so the filter is visible and can be cleared.
  const all = value === undefined || options.includes(value) ? options : [...options, value];
  return (
    <div className="corpus-filter">
      <label htmlFor={id}>{label}</label>
      <select id={id} value={value ?? ''} onChange={(e) => onChange(e.target.value === '' ? undefined : e.target.value)}>
        <option value="">{anyLabel}</option>
        {all.map((o) => (
          <option key={o} value={o}>
            {o}
          </option>
        ))}
      </select>
    </div>
  );
}

/** The table's filters; each change goes straight to the URL (see corpus-url.ts). */
export function CorpusFilters({ filter, slots, intents, annotators, layer, onLayer, blind, onFilter }: CorpusFiltersProps) {
  const [text, setText] = useState(filter.text ?? '');
  const sent = useRef(filter.text ?? '');
  // A change from outside (back button, a shared link) replaces what the box holds.
  useEffect(() => {
    const fromUrl = filter.text ?? '';
    if (fromUrl !== sent.current) {
      sent.current = fromUrl;
      setText(fromUrl);
    }
  }, [filter.text]);
  useEffect(() => {
    if (text === sent.current) return undefined;
    const timer = setTimeout(() => {
      sent.current = text;
      onFilter(without(filter, 'text', text));
    }, TYPING_PAUSE_MS);
    return () => clearTimeout(timer);
  }, [text, filter, onFilter]);

  return (
    <form className="corpus-filters" aria-label="Filter the utterances" onSubmit={(e) => e.preventDefault()}>
      <div className="corpus-filter corpus-filter-text">
        <label htmlFor="corpus-text">Search the text</label>
        <input id="corpus-text" type="search" value={text} onChange={(e) => setText(e.target.value)} />
      </div>
      {onLayer !== null && annotators.length > 0 && (
        <div className="corpus-filter">
          <label htmlFor="corpus-layer">Show labels of</label>
          <select id="corpus-layer" value={layer ?? ''} onChange={(e) => onLayer(e.target.value)}>
            {annotators.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </select>
        </div>
      )}
      <Choice id="corpus-slot" label="Slot" value={filter.slot} options={slots} anyLabel="any slot" onChange={(v) => onFilter(without(filter, 'slot', v))} />
      <Choice id="corpus-intent" label="Intent" value={filter.intent} options={intents} anyLabel="any intent" onChange={(v) => onFilter(without(filter, 'intent', v))} />
      <Choice
        id="corpus-status"
        label="Status"
        value={filter.status}
        options={LAYER_STATUSES}
        anyLabel="any status"
        onChange={(v) => onFilter(without(filter, 'status', v as LayerStatus | undefined))}
      />
      <Choice
        id="corpus-annotator"
        label="Has a layer by"
        value={filter.annotator}
        options={annotators}
        anyLabel="anyone or no one"
        onChange={(v) => onFilter(without(filter, 'annotator', v))}
      />
      <div className="corpus-filter corpus-filter-check">
        <input id="corpus-violations" type="checkbox" checked={filter.violations === true} onChange={(e) => onFilter(without(filter, 'violations', e.target.checked))} />
        <label htmlFor="corpus-violations">Has rule problems</label>
      </div>
      {!blind && (
        <div className="corpus-filter corpus-filter-check">
          <input
            id="corpus-disagreement"
            type="checkbox"
            checked={filter.disagreement === true}
            onChange={(e) => onFilter(without(filter, 'disagreement', e.target.checked))}
          />
          <label htmlFor="corpus-disagreement">Annotators differ</label>
        </div>
      )}
    </form>
  );
}

import { forwardRef, useEffect, useRef, type CSSProperties, type KeyboardEvent, type ReactElement } from 'react';
import type { SlotDef } from '../../../core/backup/model';
import { selectionFromClick, selectionRange, type TokenSelection } from '../../../core/editing';
import { spansFromTags } from '../../../core/schemes';
import type { Span, Token } from '../../../core/types';
import { colourTint, slotColour, tokenName } from './label-text';
import { suggestionTokenName } from './suggestions';

interface TokenStripProps {
  text: string;
  tokens: readonly Token[];
  tags: readonly string[];
  slots: readonly SlotDef[];
  selection: TokenSelection;
  onSelect: (selection: TokenSelection) => void;
  onKeyDown?: (event: KeyboardEvent<HTMLDivElement>) => void;
  label: string;
  /** Other annotators' layers: a picture only (hidden from screen readers, which get a text summary beside it). */
  readOnly?: boolean;
  idPrefix: string;
  /** Model suggestions over unlabelled tokens: dashed outline and a "suggested" caption, not a tint. */
  suggestions?: readonly Span[];
}

const NO_SUGGESTIONS: readonly Span[] = [];

/**
 * The utterance as separate tokens, with the original text between them (so it reads naturally), in a
 * multi-select listbox: arrows and shift+arrows (handled by the screen) or a mouse drag, snapped to
 * tokens, choose a range. Each labelled token is tinted with its slot colour, and every span ends with
 * its slot name as text, so colour is never the only cue (WCAG 2.2, 1.4.1).
 */
export const TokenStrip = forwardRef<HTMLDivElement, TokenStripProps>(function TokenStrip(props, ref) {
  const { text, tokens, tags, slots, selection, onSelect, onKeyDown, label, readOnly = false, idPrefix, suggestions = NO_SUGGESTIONS } = props;
  const drag = useRef<{ anchor: number; moved: boolean } | null>(null);
  const tagsRef = useRef(tags);
  tagsRef.current = tags;

  useEffect(() => {
    if (readOnly) return;
    const end = () => {
      const d = drag.current;
      drag.current = null;
      // A click without a drag on a labelled token selects the whole span (to relabel or remove it).
      if (d !== null && !d.moved) onSelect(selectionFromClick(tagsRef.current, d.anchor));
    };
    window.addEventListener('mouseup', end);
    return () => window.removeEventListener('mouseup', end);
  }, [onSelect, readOnly]);

  const range = readOnly ? null : selectionRange(selection, tokens.length);
  const spans = spansFromTags(tags);
  const spanOf = new Array<number>(tokens.length).fill(-1);
  spans.forEach((s, n) => {
    for (let i = s.start; i < s.end; i++) spanOf[i] = n;
  });
  const suggestedOf = new Array<number>(suggestions.length === 0 ? 0 : tokens.length).fill(-1);
  suggestions.forEach((s, n) => {
    for (let i = s.start; i < s.end; i++) if (spanOf[i] === -1) suggestedOf[i] = n;
  });

  const pieces: ReactElement[] = [];
  const lead = text.slice(0, tokens[0]?.start ?? text.length);
  if (lead !== '') pieces.push(<span key="lead" className="label-gap" aria-hidden="true">{lead}</span>);
  tokens.forEach((token, i) => {
    const n = spanOf[i] ?? -1;
    const span = n >= 0 ? spans[n] : undefined;
    const colour = span === undefined ? undefined : slotColour(slots, span.slot);
    const style: CSSProperties | undefined = colour === undefined ? undefined : { background: colourTint(colour), borderBottomColor: colour };
    const selected = range !== null && i >= range.from && i <= range.to;
    const suggestion = suggestions[suggestedOf[i] ?? -1];
    const classes = [
      'label-token',
      span !== undefined && 'in-span',
      span?.start === i && 'span-start',
      span?.end === i + 1 && 'span-end',
      suggestion !== undefined && 'suggested',
      suggestion?.start === i && 'suggested-start',
      suggestion?.end === i + 1 && 'suggested-end',
      selected && 'selected',
      !readOnly && selection.focus === i && 'focus',
    ];
    const tokenText = text.slice(token.start, token.end);
    pieces.push(
      <span
        key={`t${i}`}
        id={`${idPrefix}-tok-${i}`}
        role={readOnly ? undefined : 'option'}
        aria-selected={readOnly ? undefined : selected}
        aria-label={readOnly ? undefined : suggestion !== undefined ? suggestionTokenName(tokenText, suggestion, i) : tokenName(tokenText, tags, i)}
        className={classes.filter(Boolean).join(' ')}
        style={style}
        data-index={i}
        onMouseDown={
          readOnly
            ? undefined
            : (e) => {
                if (e.button !== 0) return;
                e.preventDefault();
                (e.currentTarget.parentElement as HTMLElement | null)?.focus();
                drag.current = { anchor: i, moved: false };
                onSelect({ anchor: i, focus: i });
              }
        }
        onMouseEnter={
          readOnly
            ? undefined
            : () => {
                const d = drag.current;
                if (d === null || d.anchor === i) return;
                d.moved = true;
                onSelect({ anchor: d.anchor, focus: i });
              }
        }
      >
        {tokenText}
      </span>,
    );
    if (suggestion !== undefined && suggestion.end === i + 1) {
      pieces.push(
        <span key={`s${i}`} className="label-caption label-caption-suggested" aria-hidden="true" style={{ borderColor: slotColour(slots, suggestion.slot) }}>
          suggested: {suggestion.slot}
        </span>,
      );
    }
    if (span !== undefined && span.end === i + 1) {
      pieces.push(
        <span key={`c${i}`} className="label-caption" aria-hidden="true" style={{ borderColor: colour }}>
          {span.slot}
        </span>,
      );
    }
    const next = tokens[i + 1];
    const gap = text.slice(token.end, next === undefined ? text.length : next.start);
    const inside = span !== undefined && span.end > i + 1;
    const insideSuggestion = suggestion !== undefined && suggestion.end > i + 1;
    if (gap !== '' || next !== undefined) {
      const gapClass = ['label-gap', gap === '' && 'label-gap-none', insideSuggestion && 'suggested-gap'].filter(Boolean).join(' ');
      pieces.push(
        <span key={`g${i}`} className={gapClass} aria-hidden="true" style={inside && style !== undefined ? { background: style.background } : undefined}>
          {gap}
        </span>,
      );
    }
  });

  if (readOnly) {
    return (
      <div ref={ref} className="label-strip read-only" aria-hidden="true">
        {pieces}
      </div>
    );
  }
  return (
    <div
      ref={ref}
      role="listbox"
      aria-multiselectable={true}
      aria-label={label}
      aria-activedescendant={tokens.length === 0 ? undefined : `${idPrefix}-tok-${selection.focus}`}
      tabIndex={0}
      className="label-strip"
      onKeyDown={onKeyDown}
    >
      {pieces}
    </div>
  );
});

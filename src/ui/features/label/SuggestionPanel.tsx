import { memo } from 'react';
import type { Token } from '../../../core/types';
import { suggestionName, type Suggestion } from './suggestions';

interface SuggestionPanelProps {
  suggestions: readonly Suggestion[];
  /** Suggestions of this utterance the labeller rejected earlier (hidden). */
  hidden: number;
  text: string;
  tokens: readonly Token[];
  blind: boolean;
  disabled: boolean;
  onAccept: (suggestion: Suggestion) => void;
  onReject: (suggestion: Suggestion) => void;
  onAcceptAll: () => void;
  onRejectAll: () => void;
  onRestore: () => void;
}

/** The model's suggestions for this utterance as a list with accept / reject, one by one or all at once. */
export const SuggestionPanel = memo(function SuggestionPanel(props: SuggestionPanelProps) {
  const { suggestions, hidden, text, tokens, blind, disabled, onAccept, onReject, onAcceptAll, onRejectAll, onRestore } = props;
  return (
    <section aria-labelledby="label-suggestions-title" className="label-suggestions" data-testid="suggestions">
      <h3 id="label-suggestions-title">Model suggestions</h3>
      <p>
        Dashed outlines marked “suggested” are the model’s guesses for tokens you have not labelled. They are not your labels and do not count as your work until you accept
        them.{blind && ' Blind labelling does not hide them: the model is a tool, not another annotator.'}
      </p>
      {suggestions.length === 0 ? (
        <p>No suggestion left for this utterance.</p>
      ) : (
        <>
          <ul className="label-suggestion-list" aria-label="Suggestions not yet accepted">
            {suggestions.map((s) => {
              const name = suggestionName(text, tokens, s);
              return (
                <li key={s.key}>
                  <span className="label-suggestion-mark">suggested</span> <span>{name}</span>
                  <button type="button" onClick={() => onAccept(s)} disabled={disabled} aria-label={`Accept suggestion ${name}`}>
                    Accept
                  </button>
                  <button type="button" onClick={() => onReject(s)} disabled={disabled} aria-label={`Reject suggestion ${name}`}>
                    Reject
                  </button>
                </li>
              );
            })}
          </ul>
          <div className="label-actions" role="group" aria-label="Every suggestion at once">
            <button type="button" onClick={onAcceptAll} disabled={disabled} aria-keyshortcuts="Shift+Y">
              Accept all (Shift+Y)
            </button>
            <button type="button" onClick={onRejectAll} disabled={disabled} aria-keyshortcuts="Shift+X">
              Reject all (Shift+X)
            </button>
          </div>
          <p className="muted">Keys: Shift+A accepts and Shift+R rejects the suggestion at the selection (or the next one after it).</p>
        </>
      )}
      {hidden > 0 && (
        <p>
          {hidden === 1 ? 'One suggestion you rejected is hidden.' : `${hidden} suggestions you rejected are hidden.`}{' '}
          <button type="button" onClick={onRestore} disabled={disabled}>
            Show rejected suggestions again
          </button>
        </p>
      )}
    </section>
  );
});

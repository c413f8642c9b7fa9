import type { Token } from '../../../core/types';
import { LabelDialog } from './LabelDialog';
import type { LabelConflict } from './label-editor';
import { layerDescribe } from './label-text';

interface ConflictPromptProps {
  conflict: LabelConflict | null;
  /** The utterance the conflict is about (it may not be the one on screen). */
  text: string;
  tokens: readonly Token[];
  onKeepTheirs: () => void;
  onApplyMine: () => void;
}

const CAUSE: Record<LabelConflict['cause'], string> = {
  edit: 'Your last edit',
  undo: 'Your undo',
  redo: 'Your redo',
};

/** A save refused because the layer changed elsewhere: both versions side by side, the user chooses. */
export function ConflictPrompt({ conflict, text, tokens, onKeepTheirs, onApplyMine }: ConflictPromptProps) {
  return (
    <LabelDialog open={conflict !== null} titleId="label-conflict-title" dismissable={false} onClose={onKeepTheirs} className="label-conflict">
      {conflict !== null && (
        <>
          <h3 id="label-conflict-title">This utterance was changed in another tab or window</h3>
          <p>
            {CAUSE[conflict.cause]} was not saved: it was based on an older version than the one stored now (revision {conflict.theirs.revision}). Nothing has been
            overwritten. Both versions stay in the edit history whichever you choose.
          </p>
          <p className="label-conflict-text">“{text}”</p>
          <div className="label-conflict-sides">
            <section aria-labelledby="label-conflict-theirs">
              <h4 id="label-conflict-theirs">Saved elsewhere</h4>
              <ul>
                {layerDescribe(text, tokens, conflict.theirs).map((line) => (
                  <li key={line}>{line}</li>
                ))}
              </ul>
            </section>
            <section aria-labelledby="label-conflict-mine">
              <h4 id="label-conflict-mine">Your version</h4>
              <ul>
                {layerDescribe(text, tokens, conflict.mine).map((line) => (
                  <li key={line}>{line}</li>
                ))}
              </ul>
            </section>
          </div>
          <p>
            Applying yours on top stores: <strong>{layerDescribe(text, tokens, conflict.mineOnTheirs).join(' · ')}</strong>
          </p>
          <div className="label-actions">
            <button type="button" data-autofocus onClick={onKeepTheirs}>
              Keep the version saved elsewhere
            </button>
            <button type="button" onClick={onApplyMine}>
              Apply my change on top
            </button>
          </div>
        </>
      )}
    </LabelDialog>
  );
}

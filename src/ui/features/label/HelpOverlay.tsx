import type { SlotDef } from '../../../core/backup/model';
import { LabelDialog } from './LabelDialog';
import { labelKeyHelp } from './label-keys';

/** Every key of the editor, from the same table the keyboard handler uses. */
export function HelpOverlay({ open, slots, onClose }: { open: boolean; slots: readonly SlotDef[]; onClose: () => void }) {
  return (
    <LabelDialog open={open} titleId="label-help-title" onClose={onClose} className="label-help">
      <h3 id="label-help-title">Keys of the label screen</h3>
      <p>Keys act when no text field is being typed in. Every edit is saved at once.</p>
      <table>
        <thead>
          <tr>
            <th scope="col">Key</th>
            <th scope="col">What it does</th>
          </tr>
        </thead>
        <tbody>
          {labelKeyHelp(slots).map((row) => (
            <tr key={`${row.keys}|${row.what}`}>
              <td>
                <kbd>{row.keys}</kbd>
              </td>
              <td>{row.what}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <button type="button" data-autofocus onClick={onClose}>
        Close (Escape)
      </button>
    </LabelDialog>
  );
}

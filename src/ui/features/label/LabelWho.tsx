import { ANNOTATOR_GOLD } from '../../../core/backup/model';

interface LabelWhoProps {
  name: string;
  layerName: string;
  adjudicator: boolean;
  blind: boolean;
  onGold: (gold: boolean) => void;
  onBlind: (blind: boolean) => void;
}

/** Who labels into which layer, and whether other layers are hidden (model suggestions never are). */
export function LabelWho({ name, layerName, adjudicator, blind, onGold, onBlind }: LabelWhoProps) {
  return (
    <div className="label-bar">
      <p>
        Labelling as <strong>{name}</strong>, into the layer <code>{layerName}</code>.
      </p>
      {adjudicator && (
        <label>
          <input type="checkbox" checked={layerName === ANNOTATOR_GOLD} onChange={(e) => onGold(e.target.checked)} /> Write the gold layer
        </label>
      )}
      <label>
        <input type="checkbox" checked={blind} onChange={(e) => onBlind(e.target.checked)} aria-describedby="label-blind-hint" /> Blind labelling (hide other layers)
      </label>
      <span id="label-blind-hint" className="muted">
        Model suggestions still show: the model is not another annotator.
      </span>
    </div>
  );
}

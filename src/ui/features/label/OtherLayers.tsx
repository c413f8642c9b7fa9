import { memo } from 'react';
import type { SlotDef } from '../../../core/backup/model';
import { selectionCaret } from '../../../core/editing';
import type { Token } from '../../../core/types';
import type { LayerRow } from '../../../db/schema';
import { TokenStrip } from './TokenStrip';
import { layerDescribe } from './label-text';

interface OtherLayersProps {
  layers: readonly LayerRow[];
  blind: boolean;
  text: string;
  tokens: readonly Token[];
  slots: readonly SlotDef[];
}

const noSelect = () => undefined;

/** Other people's (and gold or model) layers of this utterance, read-only; hidden in blind mode. */
export const OtherLayers = memo(function OtherLayers({ layers, blind, text, tokens, slots }: OtherLayersProps) {
  return (
    <section aria-labelledby="label-others-title" className="label-others">
      <h3 id="label-others-title">Other layers</h3>
      {blind ? (
        <p>Hidden while you label (blind labelling), so your choices stay your own.</p>
      ) : layers.length === 0 ? (
        <p>Nobody else has labelled this utterance.</p>
      ) : (
        <ul className="label-others-list">
          {layers.map((layer) => (
            <li key={layer.annotator} data-testid={`other-layer-${layer.annotator}`}>
              <h4>{layer.annotator}</h4>
              <TokenStrip text={text} tokens={tokens} tags={layer.tags} slots={slots} selection={selectionCaret(0)} onSelect={noSelect} label={`${layer.annotator}'s labels`} readOnly idPrefix={`other-${layer.annotator}`} />
              <p className="label-others-summary">{layerDescribe(text, tokens, layer).join(' · ')}</p>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
});

import { memo } from 'react';

interface OrderChoiceProps {
  uncertain: boolean;
  /** Utterances with a model score; undefined while counting or in corpus order. */
  scored: number | undefined;
  onChange: (uncertain: boolean) => void;
}

/** Which utterance "Next not started" opens: the corpus order, or the model's least sure first. */
export const OrderChoice = memo(function OrderChoice({ uncertain, scored, onChange }: OrderChoiceProps) {
  return (
    <fieldset className="label-order">
      <legend>“Next not started” goes</legend>
      <label>
        <input type="radio" name="label-order" checked={!uncertain} onChange={() => onChange(false)} /> in corpus order
      </label>
      <label>
        <input type="radio" name="label-order" checked={uncertain} onChange={() => onChange(true)} /> least sure first
      </label>
      <p>Least sure first opens the utterances the model was least sure about before the rest: your labels there teach the next model the most.</p>
      {uncertain && scored === 0 && <p>No utterance has model suggestions yet (train and pre-label on the Model screen), so the corpus order is used for now.</p>}
      {uncertain && scored !== undefined && scored > 0 && <p>{scored.toLocaleString('en')} pre-labelled utterances come first, least sure first; the rest follow in corpus order.</p>}
    </fieldset>
  );
});

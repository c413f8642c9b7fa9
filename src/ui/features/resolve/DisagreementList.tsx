import type { Side } from '../../../core/adjudication';
import { regionText, type ResolveModel } from './resolve-model';

interface Props {
  model: ResolveModel;
  words: readonly string[];
  current: number;
  names: { a: string; b: string };
  disabled: boolean;
  onFocus: (index: number) => void;
  onTake: (index: number, side: Side) => void;
}

/** Each disagreement with both readings, whether it is settled, and take buttons. */
export function DisagreementList({ model, words, current, names, disabled, onFocus, onTake }: Props) {
  if (model.items.length === 0) return null;
  return (
    <ol className="resolve-items" aria-label="Disagreements in this utterance">
      {model.items.map((item, i) => {
        const title = item.kind === 'intent' ? 'Intent' : `#${i + 1}: ${item.key}`;
        const readA = item.kind === 'intent' ? (model.input.a.intent ?? 'none') : regionText(item.region?.a ?? [], words);
        const readB = item.kind === 'intent' ? (model.input.b.intent ?? 'none') : regionText(item.region?.b ?? [], words);
        return (
          <li key={item.key} aria-current={i === current ? 'true' : undefined} className={i === current ? 'current' : undefined}>
            <button type="button" className="resolve-item-title" onClick={() => onFocus(i)}>
              {i === current ? '▶ ' : ''}
              {title}
            </button>{' '}
            <span className={item.decided ? 'resolve-settled' : 'resolve-open'}>{item.decided ? 'settled' : 'open'}</span>
            <div>
              A ({names.a}): {readA}
            </div>
            <div>
              B ({names.b}): {readB}
            </div>
            {!disabled && (
              <div className="resolve-take">
                <button type="button" onClick={() => onTake(i, 'a')} aria-label={`Take A (${names.a}) for ${title}`}>
                  Take A
                </button>
                <button type="button" onClick={() => onTake(i, 'b')} aria-label={`Take B (${names.b}) for ${title}`}>
                  Take B
                </button>
              </div>
            )}
          </li>
        );
      })}
    </ol>
  );
}

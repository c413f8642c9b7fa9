import { memo } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';
import { colourTint, highlightSegments, slotColour } from './highlight';

interface SlotTextProps {
  text: string;
  tokens: Int32Array;
  tags: string[] | null;
  schema: ProjectSchema;
}

/** The utterance with its labelled pieces tinted in the slot's colour and followed by the slot's name (never colour alone). */
export const SlotText = memo(function SlotText({ text, tokens, tags, schema }: SlotTextProps) {
  return (
    <>
      {highlightSegments(text, tokens, tags).map((segment, i) => {
        if (segment.slot === null) return <span key={i}>{segment.text}</span>;
        const colour = slotColour(schema, segment.slot);
        return (
          <span key={i} className="corpus-slot">
            <mark style={{ background: colourTint(colour), borderBottomColor: colour }}>{segment.text}</mark>
            <span className="corpus-slot-name"> {segment.slot}</span>
          </span>
        );
      })}
    </>
  );
});

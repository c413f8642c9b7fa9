import type { TransitionRuleId } from './ruleIds';

// Only called for tags that parsed, so the slot is everything after the one-letter prefix.
function slotOf(tag: string | null): string {
  return tag === null ? '' : tag.slice(2);
}

function quoted(tag: string | null): string {
  return tag === null ? 'nothing' : JSON.stringify(tag);
}

/** Human-readable text for one violation, e.g. "I-day follows O: a span must start with B-day". */
export function transitionMessage(rule: TransitionRuleId, previous: string | null, tag: string | null): string {
  const slot = slotOf(tag);
  const openSlot = slotOf(previous);
  const where = previous === null ? `${tag ?? ''} at utterance start` : `${tag ?? ''} follows ${previous}`;
  switch (rule) {
    case 'iob2/inside-at-start':
    case 'iob2/inside-after-outside':
      return `${where}: a span must start with B-${slot}`;
    case 'iob2/inside-after-other-slot':
      return `${where}: I-${slot} only continues an open ${slot} span; start a new one with B-${slot}`;
    case 'iob2/tag-outside-scheme':
    case 'iob1/tag-outside-scheme':
      return `${tag ?? ''} is not an ${rule === 'iob2/tag-outside-scheme' ? 'IOB2' : 'IOB1'} tag: use O, B-${slot} or I-${slot}`;
    case 'iob2/malformed-tag':
    case 'iob1/malformed-tag':
      return `${quoted(tag)} is not a tag: expected O, or B- or I- followed by a slot name`;
    case 'bioes/malformed-tag':
      return `${quoted(tag)} is not a tag: expected O, or B-, I-, E- or S- followed by a slot name`;
    case 'iob1/begin-at-start':
    case 'iob1/begin-after-outside':
    case 'iob1/begin-after-other-slot':
      return `${where}: in IOB1 a span starts with I-${slot}; B-${slot} only directly follows another ${slot} span`;
    case 'bioes/continue-at-start':
    case 'bioes/continue-after-outside':
      return `${where}: a span must start with B-${slot} (or be a single S-${slot})`;
    case 'bioes/continue-after-closed':
      return `${where}: that span is already closed; start a new one with B-${slot} or S-${slot}`;
    case 'bioes/continue-other-slot':
      return `${where}: close the ${openSlot} span with E-${openSlot} first; a new ${slot} span starts with B-${slot} or S-${slot}`;
    case 'bioes/unclosed-before-outside':
    case 'bioes/unclosed-before-begin':
      return `${where}: the ${openSlot} span must end with E-${openSlot} first (a one-token span is S-${openSlot})`;
    case 'bioes/unclosed-at-end':
      return `the utterance ends after ${previous ?? ''}: the ${openSlot} span must end with E-${openSlot} (a one-token span is S-${openSlot})`;
  }
}

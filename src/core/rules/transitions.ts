import type { Scheme } from '../types';
import type { TransitionRuleId } from './ruleIds';
import { transitionMessage } from './transitionMessages';
import {
  KIND_B,
  KIND_E,
  KIND_END,
  KIND_I,
  KIND_MALFORMED,
  KIND_O,
  KIND_S,
  KIND_START,
  tagCode,
  tagCodeKind,
  tagCodesShareSlot,
  tagsShareSlot,
} from './tagKinds';

/**
 * One illegal transition `previous -> tag`. `index` is the token index of the later token; for a span
 * still open at the end of the utterance (`tag: null`) it is the index of the last token.
 * `previous: null` is the utterance start.
 */
export interface Violation {
  index: number;
  previous: string | null;
  tag: string | null;
  rule: TransitionRuleId;
  message: string;
}

/** Judges one transition from its tags and their kinds (see `tagKind`); null when legal. */
type TransitionJudge = (previous: string, previousKind: number, next: string, nextKind: number) => TransitionRuleId | null;

// A tag outside the scheme is reported once, where it stands; the transition after it is not judged,
// since what it should have been is unknown (repairing it changes that transition anyway).
function isBarrier(kind: number, scheme: Scheme): boolean {
  return kind === KIND_MALFORMED || (scheme !== 'bioes' && (kind === KIND_E || kind === KIND_S));
}

const judgeIob2: TransitionJudge = (previous, previousKind, next, kind) => {
  if (kind === KIND_END) return null;
  if (kind === KIND_MALFORMED) return 'iob2/malformed-tag';
  if (kind === KIND_E || kind === KIND_S) return 'iob2/tag-outside-scheme';
  if (kind !== KIND_I || isBarrier(previousKind, 'iob2')) return null;
  if (previousKind === KIND_START) return 'iob2/inside-at-start';
  if (previousKind === KIND_O) return 'iob2/inside-after-outside';
  return tagsShareSlot(previous, next) ? null : 'iob2/inside-after-other-slot';
};

// IOB1 as Tjong Kim Sang & Veenstra (1999) define it: I- may open a span; B-X only directly after X.
const judgeIob1: TransitionJudge = (previous, previousKind, next, kind) => {
  if (kind === KIND_END) return null;
  if (kind === KIND_MALFORMED) return 'iob1/malformed-tag';
  if (kind === KIND_E || kind === KIND_S) return 'iob1/tag-outside-scheme';
  if (kind !== KIND_B || isBarrier(previousKind, 'iob1')) return null;
  if (previousKind === KIND_START) return 'iob1/begin-at-start';
  if (previousKind === KIND_O) return 'iob1/begin-after-outside';
  return tagsShareSlot(previous, next) ? null : 'iob1/begin-after-other-slot';
};

const judgeBioes: TransitionJudge = (previous, previousKind, next, kind) => {
  if (kind === KIND_MALFORMED) return 'bioes/malformed-tag';
  if (isBarrier(previousKind, 'bioes')) return null;
  const spanOpen = previousKind === KIND_B || previousKind === KIND_I;
  if (kind === KIND_END) return spanOpen ? 'bioes/unclosed-at-end' : null;
  const continues = kind === KIND_I || kind === KIND_E;
  if (!spanOpen) {
    if (!continues) return null;
    if (previousKind === KIND_START) return 'bioes/continue-at-start';
    return previousKind === KIND_O ? 'bioes/continue-after-outside' : 'bioes/continue-after-closed';
  }
  if (kind === KIND_O) return 'bioes/unclosed-before-outside';
  if (!continues) return 'bioes/unclosed-before-begin';
  return tagsShareSlot(previous, next) ? null : 'bioes/continue-other-slot';
};

/**
 * The judges above are the readable definition; validation runs on tables built from them, indexed
 * by `previousKind * 8 + kind`: 0 legal, +r rule r - 1 always, -r rule r - 1 only when the slots differ.
 */
const KIND_COUNT = 8;
const SAMPLE_TAGS = ['O', 'B-a', 'I-a', 'E-a', 'S-a', '?', '', ''];
const SAMPLE_OTHER_SLOT = ['O', 'B-b', 'I-b', 'E-b', 'S-b', '?', '', ''];

interface TransitionTable {
  entries: Int8Array;
  rules: TransitionRuleId[];
}

function transitionTableBuild(judge: TransitionJudge): TransitionTable {
  const entries = new Int8Array(KIND_COUNT * KIND_COUNT);
  const rules: TransitionRuleId[] = [];
  const ruleNumber = (rule: TransitionRuleId): number => {
    let at = rules.indexOf(rule);
    if (at < 0) at = rules.push(rule) - 1;
    return at + 1;
  };
  for (let previousKind = 0; previousKind < KIND_COUNT; previousKind++) {
    for (let kind = 0; kind < KIND_COUNT; kind++) {
      if (previousKind === KIND_END || kind === KIND_START) continue;
      const previous = SAMPLE_TAGS[previousKind] ?? '';
      const same = judge(previous, previousKind, SAMPLE_TAGS[kind] ?? '', kind);
      const other = judge(previous, previousKind, SAMPLE_OTHER_SLOT[kind] ?? '', kind);
      const cell = previousKind * KIND_COUNT + kind;
      if (same !== null) entries[cell] = ruleNumber(same);
      else if (other !== null) entries[cell] = -ruleNumber(other);
    }
  }
  return { entries, rules };
}

const TABLES: Record<Scheme, TransitionTable> = {
  iob1: transitionTableBuild(judgeIob1),
  iob2: transitionTableBuild(judgeIob2),
  bioes: transitionTableBuild(judgeBioes),
};

function violationMake(tags: readonly string[], i: number, rule: TransitionRuleId): Violation {
  const length = tags.length;
  const previous = i === 0 ? null : (tags[i - 1] ?? '');
  const tag = i < length ? (tags[i] ?? '') : null;
  return { index: i < length ? i : length - 1, previous, tag, rule, message: transitionMessage(rule, previous, tag) };
}

/**
 * Every illegal transition of a tag sequence under `scheme`, in token order, at most one per
 * transition (including the one into the utterance end). Clean input allocates nothing per token,
 * and each distinct tag is read once (see `tagCode`).
 */
export function transitionsValidate(tags: readonly string[], scheme: Scheme): Violation[] {
  const { entries, rules } = TABLES[scheme];
  const violations: Violation[] = [];
  const length = tags.length;
  let previous = '';
  let previousCode = KIND_START;
  for (let i = 0; i <= length; i++) {
    const next = i < length ? (tags[i] ?? '') : '';
    // Runs of one tag (O O O, I-x I-x) are the common case: the same string needs no second reading.
    const code = i >= length ? KIND_END : next === previous && i > 0 ? previousCode : tagCode(next);
    const entry = entries[tagCodeKind(previousCode) * KIND_COUNT + tagCodeKind(code)] ?? 0;
    if (entry !== 0 && (entry > 0 || !tagCodesShareSlot(previous, previousCode, next, code))) {
      violations.push(violationMake(tags, i, rules[Math.abs(entry) - 1] as TransitionRuleId));
    }
    previous = next;
    previousCode = code;
  }
  return violations;
}

/** True when the sequence has no illegal transition (stops at the first one). */
export function transitionsAreLegal(tags: readonly string[], scheme: Scheme): boolean {
  const { entries } = TABLES[scheme];
  const length = tags.length;
  let previous = '';
  let previousCode = KIND_START;
  for (let i = 0; i <= length; i++) {
    const next = i < length ? (tags[i] ?? '') : '';
    const code = i >= length ? KIND_END : next === previous && i > 0 ? previousCode : tagCode(next);
    const entry = entries[tagCodeKind(previousCode) * KIND_COUNT + tagCodeKind(code)] ?? 0;
    if (entry !== 0 && (entry > 0 || !tagCodesShareSlot(previous, previousCode, next, code))) return false;
    previous = next;
    previousCode = code;
  }
  return true;
}

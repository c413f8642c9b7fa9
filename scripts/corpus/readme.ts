/** README.md of a generated corpus folder; written by the generator so its numbers never go stale. */
import { ANNOTATOR_PROFILES, injectedCountsEmpty, type AnnotatorProfile, type InjectedCounts } from './annotators';
import type { Corpus } from './generate';
import { NOISE_RATES } from './noise';

function percent(value: number): string {
  return `${(value * 100).toFixed(1)} %`;
}

function share(part: number, whole: number): string {
  return whole === 0 ? '0' : `${part} (${percent(part / whole)})`;
}

function rateRow(profile: AnnotatorProfile, n: InjectedCounts): string {
  const illegal = n.illegalAfterO + n.illegalAfterOther;
  return [
    `| ${profile.id} | boundary off by one | ${percent(profile.boundary)} of spans | ${share(n.boundary, n.spans)} |`,
    `| ${profile.id} | wrong slot type | ${percent(profile.slotType)} of spans | ${share(n.slotType, n.spans)} |`,
    `| ${profile.id} | missed span | ${percent(profile.missed)} of spans | ${share(n.missed, n.spans)} |`,
    `| ${profile.id} | other intent on ambiguous utterances | ${percent(profile.ambiguousIntent)} | ${share(n.intentAmbiguous, n.ambiguousUtterances)} |`,
    `| ${profile.id} | other intent elsewhere | ${percent(profile.intentSlip)} | ${share(n.intentSlip, n.utterances - n.ambiguousUtterances)} |`,
    `| ${profile.id} | illegal IOB2 transition | ${percent(profile.illegal)} of utterances with a span | ${share(illegal, n.utterances)} of utterances (${n.illegalAfterO} I-X after O, ${n.illegalAfterOther} I-X after B-Y/I-Y) |`,
  ].join('\n');
}

export function corpusReadme(corpus: Corpus): string {
  const total = corpus.truth.length;
  const profiles = ANNOTATOR_PROFILES.filter((p) => corpus.layers.some((l) => l.annotator === p.id));
  const layerLines = corpus.layers
    .map((l) => `- \`${l.annotator}.iob2\`, \`${l.annotator}.jsonl\`: ${l.utterances.length} utterances labelled by the simulated annotator \`${l.annotator}\`.`)
    .join('\n');
  const rows = profiles.map((p) => rateRow(p, corpus.layers.find((l) => l.annotator === p.id)?.injected ?? injectedCountsEmpty())).join('\n');
  return `# Sample corpus: home-repair booking assistant

Generated file: do not edit by hand. Change the generator in \`scripts/corpus/\` and run
\`npm run corpus\` (which runs \`scripts/make-sample-corpus.ts\`); \`tests/scripts/corpus.test.ts\`
fails while the committed files differ from a fresh generation.

**All data here is invented.** The messages, names, neighbourhoods and booking references are made
up. Phone numbers are fictional: 555-0100 to 555-0199 (as 555-0142, (555) 0137, 555 0188,
5550161 or 555.0123). Postcodes start with Q or X, letters no UK postcode starts with.

- Seed: ${corpus.seed}; ${total} utterances, ids \`hr-00001\` onwards.
- Tokens: \`tokenise(text, { kind: 'words' })\` from \`src/core/tokenise\` (UAX #29 words, punctuation kept).
- Tags: IOB2. Intents and slots: see \`schema.json\`.

## Files

- \`utterances.txt\`: the raw texts, one per line, in id order.
- \`truth.iob2\`, \`truth.jsonl\`: the reference labels, as the generator knows them. Meta
  \`template\` names the template; \`alt_intent\` marks an ambiguous message and the other intent
  a careful reader could choose.
${layerLines}
- \`overlap-ids.txt\`: the ${corpus.overlapIds.length} ids (${percent(corpus.overlapIds.length / Math.max(1, total))}) every annotator labelled; the other utterances were dealt out between the annotators in turn.
- \`schema.json\`: intents, slots, and which slots each intent may carry.

The \`.iob2\` files keep tags exactly as labelled, illegal transitions included. The \`.jsonl\`
files store spans, which the writer decodes leniently (a stray I-X starts a span, as in the
CoNLL-2000 evaluation), so the illegal transitions show only in the \`.iob2\` files.

## Injected annotator disagreements

Each annotator starts from the reference labels and errs at these rates (chosen by us to look like
careful human work; rates are per reference span unless stated). Realised counts are for this sample;
a boundary error is skipped where no neighbouring word can move, so it lands below its rate.

| annotator | kind | rate | realised |
| --- | --- | --- | --- |
${rows}

Boundary errors mostly sweep a neighbouring "the", "on", "next", "this" or "around" into the span,
or drop a first or last word; wrong slot types swap day and time_window, service and problem, or
contact_phone and booking_ref.

## Surface noise

The texts carry typos (${percent(NOISE_RATES.typoOutsideSlot)} of longer words outside slots, ${percent(NOISE_RATES.typoInsideSlot)} inside;
${corpus.typos} in all), mixed casing, dropped punctuation, polite fluff (some of it not English) and
emoji endings (${percent(NOISE_RATES.emojiEnding)} of utterances).
The reference labels the misspelt words as they stand.
`;
}

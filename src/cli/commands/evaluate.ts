import { crfTagger, type SpanEvaluation, type SpanFigures, SpanTally } from '../../core/crf';
import { EXIT_BAD_INPUT, EXIT_OK } from '../exit-codes';
import type { CliIo } from '../io';
import type { LoadOptions } from '../load';
import { modelRead } from './tag';
import { sequencesLoad } from './train';

export interface EvaluateOptions extends LoadOptions {
  json: boolean;
}

const percent = (v: number) => (100 * v).toFixed(2).padStart(6);

function row(name: string, f: SpanFigures, width: number): string {
  return `${name.padEnd(width)}  ${percent(f.precision)}  ${percent(f.recall)}  ${percent(f.f1)}  ${String(f.truePositives + f.falseNegatives).padStart(6)}  ${String(f.truePositives + f.falsePositives).padStart(6)}\n`;
}

export function evaluationText(result: SpanEvaluation): string {
  const names = Object.keys(result.slots);
  const width = Math.max(7, ...names.map((n) => n.length));
  let out = `span scores, exact match (CoNLL-2000 convention), ${result.utterances} utterance(s)\n`;
  out += `${'slot'.padEnd(width)}  ${'prec%'.padStart(6)}  ${'rec%'.padStart(6)}  ${'F1%'.padStart(6)}  ${'gold'.padStart(6)}  ${'tagged'.padStart(6)}\n`;
  for (const name of names) out += row(name, result.slots[name] as SpanFigures, width);
  out += row('overall', result.overall, width);
  const exact = result.utterances === 0 ? 0 : result.exactUtterances / result.utterances;
  out += `utterances with every span right: ${result.exactUtterances} of ${result.utterances} (${(100 * exact).toFixed(2)}%)\n`;
  return out;
}

/** Tag GOLD with the model and score the spans against GOLD's own tags. */
export function evaluateRun(modelPath: string, gold: string, options: EvaluateOptions, io: CliIo): number {
  const model = modelRead(modelPath, io);
  if (model === null) return EXIT_BAD_INPUT;
  const sequences = sequencesLoad([gold], options, io);
  if (sequences === null) return EXIT_BAD_INPUT;
  const tagger = crfTagger(model);
  const tally = new SpanTally();
  for (const s of sequences) tally.add(s.tags, tagger.tags(s.words));
  const result = tally.result();
  io.out(options.json ? `${JSON.stringify(result, null, 2)}\n` : evaluationText(result));
  return EXIT_OK;
}

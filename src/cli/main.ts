import { parseArgs } from 'node:util';
import { SCHEMES, type Scheme } from '../core/types';
import { MASK_KINDS, type MaskKind } from '../core/privacy';
import { PRODUCT_NAME } from '../core/version';
import { agreeRun } from './commands/agree';
import { checkRun } from './commands/check';
import { convertRun, OUTPUT_FORMATS, type OutputFormat } from './commands/convert';
import { evaluateRun } from './commands/evaluate';
import { rulesRun } from './commands/rules';
import { tagRun } from './commands/tag';
import { trainRun } from './commands/train';
import { EXIT_BAD_INPUT, EXIT_OK } from './exit-codes';
import { type CliIo, processIo } from './io';
import { INPUT_FORMATS, type InputFormat } from './load';

declare const __CLI_VERSION__: string | undefined;

const USAGE = `${PRODUCT_NAME} command line

Usage:
  slotsmith check FILE... [--scheme iob1|iob2|bioes] [--from FORMAT] [--json]
      Report malformed lines and illegal tag transitions.
      Exit 0: clean; 1: transition violations only; 2: malformed or unreadable input.
  slotsmith convert IN --to iob1|iob2|bioes|jsonl [--from FORMAT] [--scheme S] [--mask digits,email] [-o OUT]
      Rewrite IN in canonical form (stdout, or OUT written atomically).
      --mask hides digits and/or e-mail addresses (same length, so labels stay aligned).
      FORMAT: ${INPUT_FORMATS.join(', ')} (detected from name and content when absent).
      CSV/TSV input also needs --column NAME.
  slotsmith agree A B [C...] [--json] [--scheme S] [--from FORMAT] [--bootstrap N] [--seed N]
      Agreement between annotation layers of the same utterances (aligned by id, else by position):
      Cohen's kappa on tags, slot types and intents, span F1, per-slot figures, and with three or
      more layers Fleiss' kappa, Krippendorff's alpha and pairwise kappas; N bootstrap resamples by
      utterance (default 1000; 0 = no intervals). Exit 2 on malformed or mismatched input.
  slotsmith train FILE... -o MODEL [--iterations N] [--c2 X] [--seed S] [--from FORMAT] [--scheme S]
      Train a CRF slot tagger (window-of-two word features, L-BFGS, L2 weight c2, default 1;
      at most N iterations, default 50) on labelled files and write the model file.
  slotsmith tag MODEL IN [-o OUT] [--to iob1|iob2|bioes|jsonl] [--from FORMAT]
      Tag every utterance of IN (any input format, plain text too) with the model; IOB2 by default.
  slotsmith evaluate MODEL GOLD [--json] [--from FORMAT] [--scheme S]
      Tag GOLD and score spans against its tags: precision, recall and F1 per slot and overall
      (micro), exact span match as in the CoNLL-2000 evaluation, plus whole-utterance matches.
  slotsmith rules [--scheme iob1|iob2|bioes] [--json]
      List the rule ids that check reports, with what each means.
  slotsmith --help | --version
`;

function oneOf<T extends string>(value: string | undefined, allowed: readonly T[], flag: string): T | undefined {
  if (value === undefined) return undefined;
  if ((allowed as readonly string[]).includes(value)) return value as T;
  throw new UsageError(`${flag} must be one of ${allowed.join(', ')} (got "${value}")`);
}

class UsageError extends Error {}

function countParse(value: string | undefined, flag: string): number | undefined {
  if (value === undefined) return undefined;
  if (!/^\d+$/.test(value)) throw new UsageError(`${flag} takes a whole number (got "${value}")`);
  return Number(value);
}

function numberParse(value: string | undefined, flag: string): number | undefined {
  if (value === undefined) return undefined;
  const parsed = Number(value);
  if (value.trim() === '' || !Number.isFinite(parsed) || parsed < 0) throw new UsageError(`${flag} takes a number ≥ 0 (got "${value}")`);
  return parsed;
}

function maskKindsParse(value: string): MaskKind[] {
  return value.split(',').map((kind) => {
    const parsed = oneOf<MaskKind>(kind.trim(), MASK_KINDS, '--mask');
    if (parsed === undefined) throw new UsageError('--mask needs digits, email or both');
    return parsed;
  });
}

function parse(argv: string[]) {
  return parseArgs({
    args: argv,
    allowPositionals: true,
    strict: true,
    options: {
      scheme: { type: 'string' },
      from: { type: 'string' },
      to: { type: 'string' },
      output: { type: 'string', short: 'o' },
      column: { type: 'string' },
      mask: { type: 'string' },
      bootstrap: { type: 'string' },
      seed: { type: 'string' },
      iterations: { type: 'string' },
      c2: { type: 'string' },
      json: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h', default: false },
      version: { type: 'boolean', short: 'v', default: false },
    },
  });
}

/** Entry point; returns the exit code so tests can call it in-process. */
export async function main(argv: string[], io: CliIo = processIo): Promise<number> {
  try {
    const { values, positionals } = parse(argv);
    if (values.version) {
      io.out(`${typeof __CLI_VERSION__ === 'string' ? __CLI_VERSION__ : 'dev'}\n`);
      return EXIT_OK;
    }
    const [command, ...files] = positionals;
    if (values.help || command === undefined || command === 'help') {
      io.out(USAGE);
      return command === undefined && !values.help ? EXIT_BAD_INPUT : EXIT_OK;
    }
    const scheme = oneOf<Scheme>(values.scheme, SCHEMES, '--scheme');
    const from = oneOf<InputFormat>(values.from, INPUT_FORMATS, '--from');
    const load = { ...(scheme && { scheme }), ...(from && { from }), ...(values.column !== undefined && { column: values.column }) };
    switch (command) {
      case 'check':
        if (files.length === 0) throw new UsageError('check needs at least one FILE');
        return checkRun(files, { ...load, json: values.json }, io);
      case 'convert': {
        if (files.length !== 1) throw new UsageError('convert takes exactly one input file');
        const to = oneOf<OutputFormat>(values.to, OUTPUT_FORMATS, '--to');
        if (to === undefined) throw new UsageError('convert needs --to iob1|iob2|bioes|jsonl');
        const output = values.output === undefined ? {} : { output: values.output };
        const mask = values.mask === undefined ? [] : maskKindsParse(values.mask);
        return convertRun(files[0] as string, { ...load, to, ...output, mask }, io);
      }
      case 'agree': {
        if (files.length < 2) throw new UsageError('agree needs at least two files (one per annotator)');
        const bootstrap = countParse(values.bootstrap, '--bootstrap');
        const seed = countParse(values.seed, '--seed');
        return agreeRun(files, { ...load, json: values.json, ...(bootstrap !== undefined && { bootstrap }), ...(seed !== undefined && { seed }) }, io);
      }
      case 'train': {
        if (files.length === 0) throw new UsageError('train needs at least one labelled FILE');
        if (values.output === undefined) throw new UsageError('train needs -o MODEL');
        const iterations = countParse(values.iterations, '--iterations');
        const c2 = numberParse(values.c2, '--c2');
        const seed = countParse(values.seed, '--seed');
        return await trainRun(files, { ...load, output: values.output, ...(iterations !== undefined && { iterations }), ...(c2 !== undefined && { c2 }), ...(seed !== undefined && { seed }) }, io);
      }
      case 'tag': {
        if (files.length !== 2) throw new UsageError('tag takes MODEL and one input file');
        const to = oneOf<OutputFormat>(values.to, OUTPUT_FORMATS, '--to');
        return tagRun(files[0] as string, files[1] as string, { ...load, ...(to !== undefined && { to }), ...(values.output !== undefined && { output: values.output }) }, io);
      }
      case 'evaluate':
        if (files.length !== 2) throw new UsageError('evaluate takes MODEL and one GOLD file');
        return evaluateRun(files[0] as string, files[1] as string, { ...load, json: values.json }, io);
      case 'rules':
        if (files.length > 0) throw new UsageError('rules takes no files');
        return rulesRun({ ...(scheme && { scheme }), json: values.json }, io);
      default:
        throw new UsageError(`unknown command "${command}"`);
    }
  } catch (error) {
    if (error instanceof UsageError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
      io.err(`slotsmith: ${(error as Error).message}\n\n${USAGE}`);
      return EXIT_BAD_INPUT;
    }
    throw error;
  }
}

import { transitionsValidate } from '../../core/rules';
import type { Scheme, Utterance } from '../../core/types';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_VIOLATIONS } from '../exit-codes';
import type { CliIo } from '../io';
import { documentLoad, type LoadOptions } from '../load';

export interface CheckViolation {
  line: number;
  tag: string | null;
  previous: string | null;
  rule: string;
  message: string;
}

export interface CheckFileReport {
  file: string;
  format: string | null;
  scheme: string | null;
  utterances: number;
  tokens: number;
  violations: CheckViolation[];
  errors: { line: number; message: string }[];
}

type Located = Pick<Utterance, 'tags' | 'tokenLines' | 'line'>;

function violationsOfUtterance(utterance: Located, scheme: Scheme, out: CheckViolation[]): void {
  for (const v of transitionsValidate(utterance.tags, scheme)) {
    const line = utterance.tokenLines?.[v.index] ?? utterance.line ?? 0;
    out.push({ line, tag: v.tag, previous: v.previous, rule: v.rule, message: v.message });
  }
}

/** Violations located at file lines: the later token of a transition, or the last token of an open span. */
export function violationsLocate(utterances: readonly Located[], scheme: Scheme): CheckViolation[] {
  const out: CheckViolation[] = [];
  for (const utterance of utterances) violationsOfUtterance(utterance, scheme, out);
  return out;
}

function schemeGiven(options: LoadOptions): Scheme | undefined {
  const from = options.from;
  return from === 'iob1' || from === 'iob2' || from === 'bioes' ? from : options.scheme;
}

export function checkFile(file: string, options: LoadOptions): CheckFileReport {
  // With the scheme known up front each utterance is validated as it streams by and nothing is kept;
  // otherwise tags and lines are kept until the scheme is detected from the whole file.
  const known = schemeGiven(options);
  const kept: Located[] = [];
  const violations: CheckViolation[] = [];
  let utterances = 0;
  let tokens = 0;
  // Token ranges are not needed here (every reader gives one tag per token), so columns skip them.
  const loaded = documentLoad(
    file,
    options,
    (utterance) => {
      utterances++;
      tokens += utterance.tags.length;
      if (known !== undefined) violationsOfUtterance(utterance, known, violations);
      else kept.push({ tags: utterance.tags, tokenLines: utterance.tokenLines ?? [], line: utterance.line ?? 0 });
    },
    { tokenRanges: false },
  );
  if (!loaded.ok) {
    return { file, format: null, scheme: null, utterances: 0, tokens: 0, violations: [], errors: [{ line: 0, message: loaded.message }] };
  }
  const { document, format } = loaded;
  if (known === undefined) for (const u of kept) violationsOfUtterance(u, document.scheme, violations);
  return { file, format, scheme: document.scheme, utterances, tokens, violations, errors: document.errors };
}

export function checkExitCode(reports: readonly CheckFileReport[]): number {
  if (reports.some((r) => r.errors.length > 0)) return EXIT_BAD_INPUT;
  if (reports.some((r) => r.violations.length > 0)) return EXIT_VIOLATIONS;
  return EXIT_OK;
}

function reportText(report: CheckFileReport): string {
  const lines: string[] = [];
  for (const e of report.errors) lines.push(`${report.file}:${e.line}: error: ${e.message}`);
  for (const v of report.violations) lines.push(`${report.file}:${v.line}: ${v.message} [${v.rule}]`);
  const scheme = report.scheme === null ? '' : ` (${report.scheme})`;
  lines.push(
    `${report.file}: ${report.utterances} utterances, ${report.tokens} tokens${scheme}: ` +
      `${report.violations.length} transition violation(s), ${report.errors.length} malformed line(s)`,
  );
  return `${lines.join('\n')}\n`;
}

export function checkRun(files: readonly string[], options: LoadOptions & { json: boolean }, io: CliIo): number {
  const reports = files.map((file) => checkFile(file, options));
  if (options.json) {
    const files = reports.map((r) => ({
      ...r,
      violations: r.violations.map(({ line, tag, previous, rule }) => ({ line, tag, previous, rule })),
    }));
    io.out(`${JSON.stringify({ files })}\n`);
  } else {
    for (const report of reports) io.out(reportText(report));
  }
  return checkExitCode(reports);
}

import { transitionsValidate } from '../../core/rules';
import type { Document } from '../../core/types';
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

/** Violations located at file lines: the later token of a transition, or the last token of an open span. */
export function violationsLocate(document: Document): CheckViolation[] {
  const out: CheckViolation[] = [];
  for (const utterance of document.utterances) {
    for (const v of transitionsValidate(utterance.tags, document.scheme)) {
      const line = utterance.tokenLines?.[v.index] ?? utterance.line ?? 0;
      out.push({ line, tag: v.tag, previous: v.previous, rule: v.rule, message: v.message });
    }
  }
  return out;
}

export function checkFile(file: string, options: LoadOptions): CheckFileReport {
  const loaded = documentLoad(file, options);
  if (!loaded.ok) {
    return { file, format: null, scheme: null, utterances: 0, tokens: 0, violations: [], errors: [{ line: 0, message: loaded.message }] };
  }
  const { document, format } = loaded;
  let tokens = 0;
  for (const utterance of document.utterances) tokens += utterance.tokens.length;
  return {
    file,
    format,
    scheme: document.scheme,
    utterances: document.utterances.length,
    tokens,
    violations: violationsLocate(document),
    errors: document.errors,
  };
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

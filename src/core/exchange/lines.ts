/**
 * Signed JSON Lines, the shared layer of both exchange formats. Every line ends in a `check`: the
 * first 16 hex digits of the SHA-256 of the line as written without it, so an edited line is named
 * by its number; the header also holds the full SHA-256 of all record lines and their count, which
 * catches removed, added or reordered lines. Line endings are read as LF either way, so a file that
 * passed through a CRLF editor without changes still reads.
 */
import { isPlainObject } from '../backup/fields';
import { EXCHANGE_FORMAT_VERSION, PACK_FORMAT, LAYERS_FORMAT, type ExchangeProblem } from './model';
import { sha256Hex } from './sha256';

const CHECK_LENGTH = 16;
const CHECK_TAIL = /,"check":"([0-9a-f]{16})"\}$/;
const ERRORS_MAX = 100;

const FORMAT_NAMES: Record<string, string> = { [PACK_FORMAT]: 'a Slotsmith pack', [LAYERS_FORMAT]: 'a Slotsmith layer file' };

/** `json` (one object) with its check appended as the last key. */
export async function lineSign(json: string): Promise<string> {
  const check = (await sha256Hex(json)).slice(0, CHECK_LENGTH);
  return `${json.slice(0, -1)},"check":"${check}"}`;
}

/** The line without its check when the check matches; why not otherwise. */
export async function lineVerify(line: string): Promise<{ ok: true; json: string } | { ok: false; reason: 'missing' | 'changed' }> {
  const match = CHECK_TAIL.exec(line);
  if (match === null) return { ok: false, reason: 'missing' };
  const json = `${line.slice(0, match.index)}}`;
  const check = (await sha256Hex(json)).slice(0, CHECK_LENGTH);
  return check === match[1] ? { ok: true, json } : { ok: false, reason: 'changed' };
}

/** Header object (without count and checksum) and records, as the text of a file. */
export async function linesEncode(header: Record<string, unknown>, records: readonly object[]): Promise<string> {
  const lines = await Promise.all(records.map((r) => lineSign(JSON.stringify(r))));
  let body = '';
  for (const line of lines) body += `${line}\n`;
  const head = await lineSign(JSON.stringify({ ...header, count: records.length, bodySha256: await sha256Hex(body) }));
  return `${head}\n${body}`;
}

export interface LinesDecoded {
  header: Record<string, unknown>;
  records: { line: number; value: Record<string, unknown> }[];
}

function splitLines(text: string): string[] {
  const lines = text.split('\n').map((l) => (l.endsWith('\r') ? l.slice(0, -1) : l));
  if (lines[0]?.charCodeAt(0) === 0xfeff) lines[0] = lines[0].slice(1);
  while (lines.length > 1 && lines[lines.length - 1] === '') lines.pop();
  return lines;
}

function headerProblem(value: unknown, format: string): string | null {
  const what = FORMAT_NAMES[format] ?? format;
  if (!isPlainObject(value) || typeof value.format !== 'string') return `not ${what}: the first line must be a "${format}" header`;
  if (value.format !== format) {
    const other = FORMAT_NAMES[value.format];
    return other === undefined ? `not ${what}: the header names the format "${value.format}"` : `this is ${other}, not ${what}`;
  }
  const version = value.version;
  if (!Number.isSafeInteger(version) || (version as number) < 1) return `"version" must be a whole number from 1, not ${JSON.stringify(version)}`;
  if ((version as number) > EXCHANGE_FORMAT_VERSION) {
    return `made by a newer Slotsmith (format version ${version as number}); this version reads up to ${EXCHANGE_FORMAT_VERSION}: update Slotsmith, then try again`;
  }
  if (!Number.isSafeInteger(value.count) || typeof value.bodySha256 !== 'string') return 'the header has no record count or checksum: the file is damaged';
  return null;
}

/**
 * Check a whole file of `format`: header, version, every line's check, the record count and the body
 * checksum. Never throws; on any problem the errors come back and nothing of the file is used.
 */
export async function linesDecode(text: string, format: string): Promise<{ ok: true; decoded: LinesDecoded } | { ok: false; errors: ExchangeProblem[] }> {
  const lines = splitLines(text);
  const first = lines[0] ?? '';
  let headerValue: unknown;
  try {
    headerValue = JSON.parse(first);
  } catch {
    headerValue = null;
  }
  const problem = headerProblem(headerValue, format);
  if (problem !== null) return { ok: false, errors: [{ line: 1, message: problem }] };
  const headerCheck = await lineVerify(first);
  if (!headerCheck.ok) return { ok: false, errors: [{ line: 1, message: checkMessage('the header', headerCheck.reason) }] };
  let header: Record<string, unknown>;
  try {
    header = JSON.parse(headerCheck.json) as Record<string, unknown>;
  } catch {
    return { ok: false, errors: [{ line: 1, message: 'the header is not valid JSON without its check: it was not written by Slotsmith' }] };
  }

  const errors: ExchangeProblem[] = [];
  const records: LinesDecoded['records'] = [];
  let body = '';
  const verified = await Promise.all(lines.slice(1).map((l) => (l === '' ? null : lineVerify(l))));
  verified.forEach((check, i) => {
    const lineNo = i + 2;
    const raw = lines[i + 1] as string;
    if (check === null) {
      errors.push({ line: lineNo, message: 'an empty line inside the file: lines were removed or the file was edited' });
      return;
    }
    body += `${raw}\n`;
    if (!check.ok) {
      errors.push({ line: lineNo, message: checkMessage('this line', check.reason) });
      return;
    }
    let value: unknown = null;
    try {
      value = JSON.parse(check.json);
    } catch {
      // A line whose check matches but is not JSON was crafted, not written by us.
    }
    if (!isPlainObject(value)) errors.push({ line: lineNo, message: 'a record must be a JSON object' });
    else records.push({ line: lineNo, value });
  });
  if (errors.length > 0) return { ok: false, errors: errors.slice(0, ERRORS_MAX) };
  const count = header.count as number;
  if (count !== lines.length - 1) {
    return { ok: false, errors: [{ line: lines.length, message: `the header lists ${count} records, the file holds ${lines.length - 1}: lines were removed or added` }] };
  }
  if ((await sha256Hex(body)) !== header.bodySha256) {
    return { ok: false, errors: [{ line: 1, message: "the file's SHA-256 checksum does not match its records: lines were reordered or swapped with another file's" }] };
  }
  return { ok: true, decoded: { header, records } };
}

function checkMessage(what: string, reason: 'missing' | 'changed'): string {
  return reason === 'missing'
    ? `${what} has no check at its end: it was cut, joined or not written by Slotsmith`
    : `${what} was changed after the file was written (its check does not match)`;
}

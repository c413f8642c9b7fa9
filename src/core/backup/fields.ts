/**
 * Field readers for the lenient restore step: a required field that is missing or of the wrong type
 * is an error (the record cannot be trusted); an optional one is dropped with a warning, so a
 * slightly damaged file still restores everything that is sound. Unknown keys are ignored, but the
 * project record's warn (see project-extras.ts, which also reads that record's strict fields).
 */
import type { ReadError } from '../types';

export interface Issues {
  errors: ReadError[];
  warnings: ReadError[];
}

export function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

export class FieldReader {
  failed = false;

  constructor(
    readonly value: Record<string, unknown>,
    readonly line: number,
    readonly issues: Issues,
    /** Prefix naming the record in messages, e.g. `utterance 12`. */
    readonly what: string,
  ) {}

  fail(message: string): void {
    this.failed = true;
    this.issues.errors.push({ line: this.line, message: `${this.what}: ${message}` });
  }

  warn(message: string): void {
    this.issues.warnings.push({ line: this.line, message: `${this.what}: ${message}` });
  }

  string(key: string): string {
    const v = this.value[key];
    if (typeof v === 'string') return v;
    this.fail(`"${key}" must be a string`);
    return '';
  }

  integer(key: string, min = 0): number {
    const v = this.value[key];
    if (Number.isSafeInteger(v) && (v as number) >= min) return v as number;
    this.fail(`"${key}" must be a whole number of at least ${min}`);
    return min;
  }

  stringOptional(key: string): string | undefined {
    const v = this.value[key];
    if (v === undefined || typeof v === 'string') return v;
    this.warn(`"${key}" is not a string; dropped`);
    return undefined;
  }

  integerOptional(key: string, min = 0): number | undefined {
    const v = this.value[key];
    if (v === undefined) return undefined;
    if (Number.isSafeInteger(v) && (v as number) >= min) return v as number;
    this.warn(`"${key}" is not a whole number of at least ${min}; dropped`);
    return undefined;
  }

  /** One of `values`; a bad or missing value becomes `fallback` with a warning, or an error without one. */
  choice<T extends string>(key: string, values: readonly T[], fallback?: T): T {
    const v = this.value[key];
    if (typeof v === 'string' && (values as readonly string[]).includes(v)) return v as T;
    if (fallback === undefined) {
      this.fail(`"${key}" must be one of ${values.join(', ')}`);
      return values[0] as T;
    }
    if (v !== undefined) this.warn(`"${key}" ${JSON.stringify(v)} is unknown; using ${fallback}`);
    return fallback;
  }

  stringArray(key: string): string[] {
    const v = this.value[key];
    if (Array.isArray(v) && v.every((x) => typeof x === 'string')) return v as string[];
    this.fail(`"${key}" must be a list of strings`);
    return [];
  }

  stringArrayOptional(key: string): string[] | undefined {
    const v = this.value[key];
    if (v === undefined) return undefined;
    if (Array.isArray(v) && v.every((x) => typeof x === 'string')) return v as string[];
    this.warn(`"${key}" is not a list of strings; dropped`);
    return undefined;
  }

  /** `null` or a string; a missing key reads as null. */
  stringOrNull(key: string): string | null {
    const v = this.value[key];
    if (v === undefined || v === null) return null;
    if (typeof v === 'string') return v;
    this.fail(`"${key}" must be a string or null`);
    return null;
  }

  /** A nested object read with the same issue lists; null when absent or not an object (then an error). */
  object(key: string, what: string): FieldReader | null {
    const v = this.value[key];
    if (isPlainObject(v)) return this.nested(v, what);
    this.fail(`"${key}" must be an object`);
    return null;
  }

  nested(value: Record<string, unknown>, what: string): FieldReader {
    const child = new FieldReader(value, this.line, this.issues, `${this.what}, ${what}`);
    // Failure of a nested part fails the whole record.
    const fail = child.fail.bind(child);
    child.fail = (message: string) => {
      this.failed = true;
      fail(message);
    };
    return child;
  }
}

/** Copy optional properties that are present; keeps `exactOptionalPropertyTypes` honest. */
export function withDefined<T extends object>(target: T, extra: { [K in keyof T]?: T[K] | undefined }): T {
  for (const key of Object.keys(extra) as (keyof T)[]) {
    const value = extra[key];
    if (value !== undefined) target[key] = value as T[keyof T];
  }
  return target;
}

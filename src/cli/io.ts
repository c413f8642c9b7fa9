import { renameSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

/** Streams the CLI writes to; injected so tests can capture them without spawning a process. */
export interface CliIo {
  out: (text: string) => void;
  err: (text: string) => void;
}

export const processIo: CliIo = {
  out: (text) => process.stdout.write(text),
  err: (text) => process.stderr.write(text),
};

/** Write through a temporary file and rename, so a failed run never leaves a half-written OUT. */
export function fileWriteAtomic(path: string, content: string): void {
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  writeFileSync(temporary, content);
  renameSync(temporary, path);
}

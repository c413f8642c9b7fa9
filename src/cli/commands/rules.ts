import { RULE_TABLE } from '../../core/rules';
import type { Scheme } from '../../core/types';
import { EXIT_OK } from '../exit-codes';
import type { CliIo } from '../io';

/** `slotsmith rules`: every rule id `check` can report, so a pipeline can filter on them. */
export function rulesRun(options: { scheme?: Scheme; json: boolean }, io: CliIo): number {
  const rules = RULE_TABLE.filter((r) => options.scheme === undefined || r.scheme === options.scheme || r.scheme === null);
  if (options.json) {
    io.out(`${JSON.stringify({ rules })}\n`);
    return EXIT_OK;
  }
  const width = Math.max(...rules.map((r) => r.id.length));
  for (const r of rules) io.out(`${r.id.padEnd(width)}  ${r.description}\n`);
  return EXIT_OK;
}

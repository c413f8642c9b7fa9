import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';
import { repoRoot } from '../cli/run-cli';

// The layering rules live in eslint.config.js; these cases prove the config really rejects each breach.
const eslint = new ESLint({ cwd: repoRoot });

async function ruleIds(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: `${repoRoot}/${filePath}` });
  return (result?.messages ?? []).map((m) => m.ruleId ?? 'fatal');
}

describe('lint enforces the layers', () => {
  it.each([
    ['React', "import { useState } from 'react';\nexport const x = useState;\n"],
    ['Dexie', "import Dexie from 'dexie';\nexport const x = Dexie;\n"],
    ['zustand', "import { create } from 'zustand';\nexport const x = create;\n"],
    ['a Node built-in', "import { readFileSync } from 'node:fs';\nexport const x = readFileSync;\n"],
    ['the ui layer', "import { App } from '../../ui/App';\nexport const x = App;\n"],
    ['the cli layer', "import { main } from '../../cli/main';\nexport const x = main;\n"],
    ['the db layer, even for types', "import type { Db } from '../../db/schema';\nexport type X = Db;\n"],
  ])('src/core may not import %s', async (_what, code) => {
    expect(await ruleIds('src/core/schemes/probe.ts', code)).toContain('no-restricted-imports');
  });

  it.each(['document.title', 'window.alert', 'process.exit', 'localStorage.clear'])('src/core may not touch %s', async (expr) => {
    expect(await ruleIds('src/core/schemes/probe.ts', `export const f = () => ${expr};\n`)).toContain('no-restricted-globals');
  });

  it('src/core may import other core modules', async () => {
    expect(await ruleIds('src/core/schemes/probe.ts', "import { tagParse } from './tag';\nexport const x = tagParse;\n")).toEqual([]);
  });

  it('the command line may not import the UI or Dexie', async () => {
    expect(await ruleIds('src/cli/probe.ts', "import { App } from '../ui/App';\nexport const x = App;\n")).toContain('no-restricted-imports');
    expect(await ruleIds('src/cli/probe.ts', "import Dexie from 'dexie';\nexport const x = Dexie;\n")).toContain('no-restricted-imports');
  });

  it('the UI may import core', async () => {
    expect(await ruleIds('src/ui/probe.ts', "import { tagParse } from '../core/schemes';\nexport const x = tagParse;\n")).toEqual([]);
  });
});

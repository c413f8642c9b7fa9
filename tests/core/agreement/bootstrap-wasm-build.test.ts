import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { BYTES_PATH, WAT_PATH, wasmCompile, wasmModuleText } from '../../../scripts/wasm-build.mjs';
import { base64Bytes } from '../../../src/core/agreement/bootstrap-wasm';
import { BOOTSTRAP_WASM_BASE64 } from '../../../src/core/agreement/wasm/bootstrap-bytes';

describe('the committed WebAssembly bytes', () => {
  it('are exactly what the WAT source compiles to (run `npm run wasm` after editing it)', async () => {
    const bytes = await wasmCompile(readFileSync(WAT_PATH, 'utf8'));
    expect(readFileSync(BYTES_PATH, 'utf8')).toBe(wasmModuleText(bytes));
    expect(base64Bytes(BOOTSTRAP_WASM_BASE64)).toEqual(bytes);
  });
});

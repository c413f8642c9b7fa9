/**
 * The bootstrap's WebAssembly module in Chromium under the app's own Content-Security-Policy: the
 * page and a worker it starts compile it (SIMD validates, 'wasm-unsafe-eval' allows it) and its
 * one-change replay counts exactly what the JS replay counts; without 'wasm-unsafe-eval' the same
 * page refuses to compile it (so core falls back to JS there).
 */
import { expect, test } from '@playwright/test';
import { bootstrapPatchRange } from '../src/core/agreement/bootstrap-patch';
import { base64Bytes } from '../src/core/agreement/bootstrap-wasm';
import { BOOTSTRAP_WASM_BASE64 } from '../src/core/agreement/wasm/bootstrap-bytes';

interface HitsArgs {
  count: number;
  low: number;
  span: number;
  state: number;
  stride: number;
  resamples: number;
}

/** Runs in the browser: the module's `hitsOne` on `args` (as core's `wasmHitsOne` calls it). */
function hitsRun(bytes: number[], args: HitsArgs): number[] {
  const wasm = new WebAssembly.Instance(new WebAssembly.Module(new Uint8Array(bytes)), {}).exports as {
    memory: WebAssembly.Memory;
    hitsOne: (count: number, low: number, span: number, out: number, state: number, stride: number, resamples: number) => void;
  };
  wasm.hitsOne(args.count, args.low | 0, args.span | 0, 0, args.state, args.stride, args.resamples);
  return Array.from(new Int32Array(wasm.memory.buffer, 0, args.resamples));
}

test('the page and its worker run the bootstrap module under the app CSP, with the JS counts', async ({ page }) => {
  const bytes = Array.from(base64Bytes(BOOTSTRAP_WASM_BASE64));
  // Utterance 37 of 1,000 changed; its draws are the outputs [low, low + span) (floor(x · 1000 / 2^32) = 37).
  const count = 1000;
  const low = Math.ceil((37 * 2 ** 32) / count);
  const span = Math.ceil((38 * 2 ** 32) / count) - low;
  const seed = 12345;
  const resamples = 13;
  const args: HitsArgs = { count, low, span, state: seed, stride: Math.imul(count, 0x6d2b79f5), resamples };
  // The JS replay with a change of 1 in one column counts the same draws.
  const js = Array.from(bootstrapPatchRange({ positions: Int32Array.from([37]), deltas: Float64Array.from([1]), count, width: 1, seed }, 0, resamples, { engine: 'js' }));
  expect(js.some((h) => h > 0)).toBe(true);

  await page.goto('/');
  const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
  expect(csp).toContain("'wasm-unsafe-eval'");
  const source = hitsRun.toString();
  // In the page itself (the expression is handed over by the test driver, not eval'd by the page).
  expect(await page.evaluate(`(${source})(${JSON.stringify(bytes)}, ${JSON.stringify(args)})`)).toEqual(js);
  const ran = await page.evaluate(
    async ({ bytes, args, source }) => {
      // The worker gets the function as script text in a blob (allowed by worker-src blob:); it
      // inherits the page's CSP, so it compiles only because script-src allows 'wasm-unsafe-eval'.
      const text = `const hitsRun = ${source};\nonmessage = (e) => { try { postMessage(hitsRun(e.data.bytes, e.data.args)); } catch (err) { postMessage(String(err)); } };`;
      const worker = new Worker(URL.createObjectURL(new Blob([text], { type: 'text/javascript' })));
      const inWorker = await new Promise<unknown>((resolve) => {
        worker.onmessage = (e) => resolve(e.data);
        worker.postMessage({ bytes, args });
      });
      worker.terminate();
      return { simd: WebAssembly.validate(new Uint8Array(bytes)), inWorker };
    },
    { bytes, args, source },
  );
  expect(ran.simd).toBe(true);
  expect(ran.inWorker).toEqual(js);

  // Control: the same page without 'wasm-unsafe-eval' refuses to compile the module.
  await page.route('**/no-wasm.html', (route) =>
    route.fulfill({ contentType: 'text/html', body: `<!doctype html><meta http-equiv="Content-Security-Policy" content="default-src 'self'; script-src 'self'"><title>no wasm</title>` }),
  );
  await page.goto('/no-wasm.html');
  const refused = await page.evaluate(`(() => { try { (${source})(${JSON.stringify(bytes)}, ${JSON.stringify(args)}); return 'compiled'; } catch (e) { return String(e); } })()`);
  expect(refused).toMatch(/CompileError|EvalError|Content Security Policy/i);
});

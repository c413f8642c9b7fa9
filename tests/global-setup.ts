import { cliBuild } from '../scripts/build-cli.mjs';

// Build the CLI bundle once, before any test file spawns it (parallel rebuilds would race). A build
// failure only warns here: the CLI tests then fail on their own, and unrelated suites still run.
export default async function setup(): Promise<void> {
  try {
    await cliBuild();
  } catch (error) {
    console.warn(`[global-setup] CLI bundle not built: ${(error as Error).message.split('\n')[0]}`);
  }
}

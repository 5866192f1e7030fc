#!/usr/bin/env node
// The command line's entry point: runs the bundle that `npm install` (prepare) or `npm run build:cli` writes.
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const bundle = join(dirname(fileURLToPath(import.meta.url)), '..', 'build', 'cli.mjs');
if (!existsSync(bundle)) {
  process.stderr.write('longipane: the command line is not built yet. Run `npm install` or `npm run build:cli` first.\n');
  process.exit(2);
}
const { main, removeTemporariesOnSignal } = await import(bundle);
removeTemporariesOnSignal();
process.exitCode = await main(process.argv.slice(2));

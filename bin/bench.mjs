#!/usr/bin/env node
// `npm run bench`: runs every test/bench/*.bench.ts in its own process (so memory figures are its
// own) and prints what each reports. Each prints its figures beside a reference measured in the same
// run. `npm run bench -- NAME` runs only the benches whose file name contains NAME.
import { readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dir = join(root, 'test', 'bench');
const only = process.argv.slice(2);
const files = readdirSync(dir)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();
let failed = 0;
for (const f of files) {
  console.log(`\n=== ${f}`);
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--expose-gc', join(dir, f)], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) failed++;
}
process.exitCode = failed ? 1 : 0;

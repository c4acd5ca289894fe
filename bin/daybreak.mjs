#!/usr/bin/env node
// Command-line entry: `daybreak info ...`, `daybreak scan ...`, `daybreak demo ...`.
// The TypeScript sources run through tsx. For `scan` and `info`, which other tools call often, a
// bundle of the command line (dist/cli/main.mjs, made with esbuild) is used when it is newer than
// every source file, and made when it is missing or stale: loading it takes a tenth of compiling the
// sources at each start. The bundle holds the libraries as well (no package lookups at start).
import { existsSync, readdirSync, renameSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const bundle = join(root, 'dist', 'cli', 'main.mjs');

function newestSource(dir, newest = 0) {
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) newest = newestSource(p, newest);
    else if (e.name.endsWith('.ts')) newest = Math.max(newest, statSync(p).mtimeMs);
  }
  return newest;
}

async function bundled() {
  try {
    // Stale when a source or the installed libraries (package-lock.json) changed after it was made.
    const lock = join(root, 'package-lock.json');
    const newest = Math.max(newestSource(join(root, 'core')), newestSource(join(root, 'electron')), existsSync(lock) ? statSync(lock).mtimeMs : 0);
    const fresh = existsSync(bundle) && statSync(bundle).mtimeMs >= newest;
    if (!fresh) {
      const { build } = await import('esbuild');
      // Built beside and renamed into place, so a command started meanwhile never loads half a file.
      const tmp = `${bundle}.${process.pid}.tmp.mjs`;
      await build({
        entryPoints: [join(root, 'electron', 'host', 'cli', 'main.ts')], outfile: tmp, bundle: true, platform: 'node',
        format: 'esm', target: 'node20', logLevel: 'silent',
        // The libraries go into the bundle too: resolving them and scanning their CommonJS exports at
        // each start took about 70 ms of the 0.2 s a command needs before its work. Bundled CommonJS
        // code that calls require() (for Node's own modules) gets one made here.
        banner: { js: "import { createRequire as daybreakRequire } from 'node:module'; const require = daybreakRequire(import.meta.url);" },
      });
      renameSync(tmp, bundle);
    }
    return await import(pathToFileURL(bundle).href);
  } catch {
    return null; // no esbuild or a failed build: run from the sources
  }
}

const fast = ['scan', 'info'].includes(process.argv[2]) ? await bundled() : null;
let main;
if (fast) {
  main = fast.main;
} else {
  const { register } = await import('tsx/esm/api');
  register();
  ({ main } = await import('../electron/host/cli/main.ts'));
}
process.exitCode = await main(process.argv.slice(2));

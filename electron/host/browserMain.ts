/**
 * Browser mode: `npm run browser` serves the built renderer and the host on 127.0.0.1 and prints the
 * address (with its per-run token) to open in a browser. Options: --port N, --demo-dir DIR,
 * --static-dir DIR (the built renderer), --user-dir DIR (settings and reviews of read-only data).
 */
import { join, dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { existsSync, readFileSync } from 'node:fs';
import { homedir } from 'node:os';
import { HostService } from './service';
import { startBrowserServer } from './server';
import { generateDemoScenario } from './demo';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

export interface BrowserModeOptions { port?: number; demoDir?: string; staticDir?: string; userDir?: string }

export async function runBrowserMode(opts: BrowserModeOptions = {}) {
  const staticDir = opts.staticDir ?? join(repoRoot, 'dist', 'renderer');
  if (!existsSync(join(staticDir, 'index.html'))) {
    throw new Error(`the renderer is not built (${staticDir}/index.html missing): run "npm run build" first`);
  }
  const version = JSON.parse(readFileSync(join(repoRoot, 'package.json'), 'utf8')).version as string;
  const service = new HostService({
    mode: 'browser',
    version,
    demoRoot: opts.demoDir ?? process.env.DAYBREAK_DEMO_DIR ?? join(repoRoot, 'samples', 'generated'),
    userDir: opts.userDir ?? process.env.DAYBREAK_USER_DIR ?? join(homedir(), '.daybreak'),
    generateDemo: generateDemoScenario,
  });
  return startBrowserServer({ service, staticDir, port: opts.port });
}

function argValue(args: string[], name: string): string | undefined {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const port = argValue(args, '--port');
  runBrowserMode({
    port: port ? Number(port) : undefined, demoDir: argValue(args, '--demo-dir'),
    staticDir: argValue(args, '--static-dir'), userDir: argValue(args, '--user-dir'),
  }).then(
    (s) => {
      console.log(`Daybreak (browser mode) is at:\n  ${s.url}\nOpen that address; it works only on this computer. Ctrl+C stops it.`);
    },
    (e: unknown) => {
      console.error(`daybreak: ${e instanceof Error ? e.message : e}`);
      process.exit(2);
    },
  );
}

/**
 * End-to-end helper: builds the renderer, serves it in browser mode on 127.0.0.1 and drives Debian's
 * Chromium with playwright-core (no browser download).
 */
import { build } from 'vite';
import { mkdtempSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { runBrowserMode } from '../../electron/host/browserMain';
import type { BrowserServer } from '../../electron/host/server';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const CHROMIUM = process.env.DAYBREAK_CHROMIUM ?? '/usr/bin/chromium';
export const outputDir = join(repoRoot, 'test', 'output');

let built: Promise<string> | null = null;

/** Builds the renderer once per test file into a private folder. */
export function buildRenderer(): Promise<string> {
  built ??= (async () => {
    const outDir = mkdtempSync(join(tmpdir(), 'daybreak-renderer-'));
    await build({
      configFile: join(repoRoot, 'vite.config.ts'),
      logLevel: 'warn',
      build: { outDir, emptyOutDir: true, sourcemap: false },
    });
    return outDir;
  })();
  return built;
}

export interface RunningApp {
  server: BrowserServer;
  browser: Browser;
  page: Page;
  close(): Promise<void>;
}

export async function openApp(opts: { demoDir: string; width?: number; height?: number }): Promise<RunningApp> {
  const staticDir = await buildRenderer();
  // A fresh user folder per run: review files of read-only datasets and settings go there, never into ~.
  const userDir = mkdtempSync(join(tmpdir(), 'daybreak-user-'));
  const server = await runBrowserMode({ port: 0, demoDir: opts.demoDir, staticDir, userDir });
  // playwright-core gives every launch a new, empty user-data-dir of its own.
  const browser = await chromium.launch({
    executablePath: CHROMIUM,
    args: [
      '--no-sandbox', '--headless', '--disable-gpu',
      '--disable-background-networking', '--disable-component-update', '--no-first-run', '--disable-sync',
    ],
  });
  const page = await browser.newPage({ viewport: { width: opts.width ?? 1400, height: opts.height ?? 860 } });
  await page.goto(server.url);
  return {
    server, browser, page,
    async close() {
      await browser.close();
      await server.close();
    },
  };
}

export function screenshotPath(name: string): string {
  mkdirSync(outputDir, { recursive: true });
  return join(outputDir, `${name}.png`);
}

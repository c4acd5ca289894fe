import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { buildRenderer, CHROMIUM, screenshotPath } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';
import { REVIEW_FILE_NAME } from '../../electron/host/reviewStore';
import { parseReview } from '../../core/review';

// The real records (copied, so the review file can be written beside them).
const REAL = resolve(__dirname, '..', '..', '..', 'shared', 'data', 'real-microseismic');
const repo = resolve(__dirname, '..', '..');

function startHost(staticDir: string, demoDir: string, userDir: string): Promise<{ child: ChildProcess; url: string }> {
  const child = spawn(process.execPath, ['--import', 'tsx', join(repo, 'electron/host/browserMain.ts'), '--static-dir', staticDir, '--demo-dir', demoDir, '--user-dir', userDir], { cwd: repo, stdio: ['ignore', 'pipe', 'inherit'] });
  return new Promise((ok, fail) => {
    let out = '';
    child.stdout!.on('data', (b: Buffer) => {
      out += b.toString();
      const m = /(http:\/\/127\.0\.0\.1:\d+\/#token=[0-9a-f]+)/.exec(out);
      if (m) ok({ child, url: m[1] });
    });
    child.once('exit', (code) => fail(new Error(`host exited early (${code}): ${out}`)));
  });
}

describe('killing the host process during a burst of edits (Chromium, browser mode in a child process)', () => {
  let browser: Browser;
  let page: Page;
  let data: string;
  let host: { child: ChildProcess; url: string };
  let staticDir: string;
  let demoDir: string;
  let userDir: string;

  beforeAll(async () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
    data = mkdtempSync(join(tmpdir(), 'daybreak-kill-'));
    cpSync(REAL, data, { recursive: true });
    demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    userDir = mkdtempSync(join(tmpdir(), 'daybreak-user-'));
    staticDir = await buildRenderer();
    host = await startHost(staticDir, demoDir, userDir);
    browser = await chromium.launch({ executablePath: CHROMIUM, args: ['--no-sandbox', '--headless', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'] });
    page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
    await page.goto(host.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(data)}#`));
    await page.locator('.trace-row').first().waitFor({ timeout: 60_000 });
  }, 120_000);
  afterAll(async () => {
    await browser?.close();
    host?.child.kill('SIGKILL');
  });

  it('leaves a whole review file that reopens with the edits made before the kill', async () => {
    const box = (await page.locator('.trace-row:visible .trace-plot').first().boundingBox())!;
    // A burst of edits: P picks placed along the first rows, as fast as the keyboard goes.
    const burst = (async () => {
      for (let i = 0; i < 40; i++) {
        await page.mouse.move(box.x + box.width * (0.05 + 0.02 * i), box.y + 6 + (i % 3) * 110);
        await page.keyboard.press('r');
      }
    })().catch(() => undefined); // the page loses its host mid-burst
    // Kill the host once some edits have reached the disk.
    const file = join(data, REVIEW_FILE_NAME);
    for (let i = 0; i < 200 && !(existsSync(file) && parseReview(readFileSync(file, 'utf8'), file).revision >= 6); i++) {
      await new Promise((r) => setTimeout(r, 25));
    }
    host.child.kill('SIGKILL');
    await burst;
    const text = readFileSync(file, 'utf8');
    const doc = parseReview(text, file); // throws if the file were cut or mixed
    expect(doc.revision).toBeGreaterThanOrEqual(6);
    const picks = doc.events.flatMap((e) => e.picks);
    expect(picks.length).toBeGreaterThan(0);
    // A new host (the old one's lock is left by a dead process and is taken over) reopens it.
    host = await startHost(staticDir, demoDir, userDir);
    await page.goto(host.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(data)}#`));
    await page.locator('.event-list li.current').waitFor({ timeout: 60_000 });
    expect(await page.locator('.banner').isHidden()).toBe(true);
    const info = await page.locator('.event-list li.current .ev-info').innerText();
    expect(info).toContain(`${picks.length} picks`);
    await page.screenshot({ path: screenshotPath('after-kill') });
  }, 120_000);
});

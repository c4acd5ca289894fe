/**
 * Review-desk timings through the browser mode in Debian's Chromium, on the demo scenario
 * (samples/generated, made first if missing). Each figure is printed beside the machine's own
 * baseline for one frame (the interval between two animation frames, ~16.7 ms at 60 Hz) and the
 * issue's budget.
 */
import { existsSync } from 'node:fs';
import { join, resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { openApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const demo = join(repo, 'samples', 'generated');

interface View { x0: number; x1: number; timings: { readMs: number; drawMs: number; rows: number; channels: number }; openMs: number; overviewMs: number; frameMs: number }

async function main() {
  if (!existsSync(join(demo, DEMO_COMPLETE_MARKER))) {
    const { writeScenario } = await import('../../electron/host/scenario');
    console.log('making the demo scenario first...');
    await writeScenario(demo, {});
  }
  const app = await openApp({ demoDir: demo, width: 1600, height: 1000 });
  const page = app.page;
  const view = async () => (await page.evaluate('window.daybreakView()')) as View;
  // (waitForFunction would evaluate text in the page, which its Content-Security-Policy forbids.)
  const untilChanged = async (prev: number) => {
    for (let i = 0; i < 600; i++) {
      if ((await view()).timings.readMs !== prev) return;
      await new Promise((r) => setTimeout(r, 50));
    }
    throw new Error('the window did not load within 30 s');
  };
  await page.locator('.trace-row').first().waitFor({ timeout: 180_000 });
  await page.waitForTimeout(500);
  // Page scripts are given as text: tsx would add helper calls to compiled functions that the page lacks.
  const frame = (await page.evaluate(`new Promise((ok) => {
    const ts = [];
    const step = (t) => { ts.push(t); if (ts.length < 31) requestAnimationFrame(step); else ok((ts[30] - ts[0]) / 30); };
    requestAnimationFrame(step);
  })`)) as number;
  const v0 = await view();
  const lines: string[] = [];
  const row = (what: string, ms: number, budget: number | null) =>
    lines.push(`${what.padEnd(58)} ${ms.toFixed(1).padStart(8)} ms  (${(ms / frame).toFixed(1)} frames${budget ? `; budget ${budget} ms: ${ms <= budget ? 'met' : 'NOT met'}` : ''})`);
  lines.push(`baseline: one animation frame = ${frame.toFixed(1)} ms`);
  row(`index the night (decode ${v0.timings.channels} channels in workers)`, v0.openMs, null);
  row('draw the night overview after decoding', v0.overviewMs, 500);
  // Open several moments from the overview; take the median.
  const box = (await page.locator('canvas.overview-canvas').boundingBox())!;
  const reads: number[] = [];
  const draws: number[] = [];
  for (const f of [0.12, 0.33, 0.5, 0.71, 0.9]) {
    await page.mouse.click(box.x + box.width * f, box.y + 4);
    await untilChanged((await view()).timings.readMs);
    const t = (await view()).timings;
    reads.push(t.readMs);
    draws.push(t.drawMs);
  }
  const med = (a: number[]) => [...a].sort((x, y) => x - y)[a.length >> 1];
  const t = (await view()).timings;
  row(`open a 90 s window, ${t.rows} sites / ${t.channels} channels: read, decode, filter`, med(reads), null);
  row(`  ... and draw it`, med(draws), null);
  row(`  ... until drawn (sum)`, med(reads) + med(draws), 150);
  // Re-filter every visible trace (preset 3).
  const before = (await view()).timings.readMs;
  await page.keyboard.press('3');
  await untilChanged(before);
  const rf = (await view()).timings;
  row('re-filter all traces (read again + filter + draw)', rf.readMs + rf.drawMs, 50);
  // A pan frame: arrow key to the next painted frame.
  await page.mouse.move(box.x + 300, box.y + 400);
  const pans: number[] = [];
  const panWork: number[] = [];
  for (let i = 0; i < 10; i++) {
    pans.push((await page.evaluate(`new Promise((ok) => {
      const t0 = performance.now();
      document.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
      requestAnimationFrame(() => requestAnimationFrame(() => ok(performance.now() - t0)));
    })`)) as number);
    panWork.push((await view()).frameMs);
  }
  row('pan one step: the frame\'s drawing work', med(panWork), 16);
  row('pan one step until painted (two frames of latency included)', med(pans), null);
  console.log(lines.join('\n'));
  await app.close();
}

main().catch((e) => { console.error(e); process.exit(1); });

/**
 * Review-desk timings through the browser mode in Debian's Chromium.
 *
 * 1. The demo scenario (samples/generated, made first if missing): indexing the night, the night
 *    overview, and a pan frame.
 * 2. Generated networks of 12 and 60 three-component 100 Hz sites (test/support/siteNetwork.ts,
 *    written to a temporary folder and removed afterwards) with three events whose review windows are
 *    90 s long and carry P and S picks at every site: opening an event until its rows in view are
 *    drawn, until every row is loaded, and re-filtering the rows in view.
 *
 * Every figure is printed beside the machine's own references measured in the same page in the same
 * run: one animation frame (the display's interval), an empty frame (from asking for a frame to the
 * task after its paint, with nothing to draw) and a fixed piece of arithmetic (a CPU reference, so
 * figures from a loaded machine can be compared with those from a quiet one), and beside the issue's
 * budget. Each figure is the median of several runs; the spread (min-max) is printed too.
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import { openApp, type RunningApp } from '../support/browserApp';
import { networkScenario, writeNetworkDataset } from '../support/siteNetwork';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const demo = join(repo, 'samples', 'generated');

interface Timings { readMs: number; drawMs: number; rows: number; channels: number; allMs?: number; rowsDrawMs?: number; complete?: boolean }
interface View { x0: number; x1: number; timings: Timings; openMs: number; overviewMs: number; frameMs: number }

const med = (a: number[]) => [...a].sort((x, y) => x - y)[a.length >> 1];
const view = async (page: Page) => (await page.evaluate('window.daybreakView()')) as View;
/** Waits until a new window load has finished, every row included. */
async function untilLoaded(page: Page, prev: Timings): Promise<Timings> {
  for (let i = 0; i < 1200; i++) {
    const t = (await view(page)).timings;
    if ((t.complete ?? true) && (t.readMs !== prev.readMs || t.drawMs !== prev.drawMs)) return t;
    await page.waitForTimeout(25);
  }
  throw new Error('the window did not load within 30 s');
}

interface Refs { frame: number; emptyFrame: number; cpu: number; shared: string }

// Page scripts are given as text: tsx would add helper calls to compiled functions that the page lacks.
async function references(page: Page): Promise<Refs> {
  const frame = (await page.evaluate(`new Promise((ok) => {
    const ts = [];
    const step = (t) => { ts.push(t); if (ts.length < 31) requestAnimationFrame(step); else ok((ts[30] - ts[0]) / 30); };
    requestAnimationFrame(step);
  })`)) as number;
  const empties: number[] = [];
  for (let i = 0; i < 9; i++) {
    empties.push((await page.evaluate(`new Promise((ok) => { const t0 = performance.now(); requestAnimationFrame(() => setTimeout(() => ok(performance.now() - t0), 0)); })`)) as number);
  }
  const cpus: number[] = [];
  for (let i = 0; i < 5; i++) {
    // A fixed piece of arithmetic: a two-pole recursion over 2 million samples.
    cpus.push((await page.evaluate(`(() => { const t0 = performance.now(); const x = new Float64Array(2e6); let a = 0, b = 0;
      for (let i = 0; i < x.length; i++) { const y = ((i * 7919) % 1000) * 1e-3 + 1.6 * a - 0.64 * b; b = a; a = y; x[i] = y; }
      return performance.now() - t0 + x[12345] * 0; })()`)) as number);
  }
  const shared = (await page.evaluate('`${typeof SharedArrayBuffer} ${self.crossOriginIsolated}`')) as string;
  return { frame, emptyFrame: med(empties), cpu: med(cpus), shared };
}

function reporter(refs: Refs) {
  const lines: string[] = [];
  lines.push(`references: one animation frame ${refs.frame.toFixed(1)} ms; an empty frame until painted ${refs.emptyFrame.toFixed(1)} ms; CPU reference ${refs.cpu.toFixed(1)} ms`);
  // Without COOP/COEP headers the page is not cross-origin isolated and has no SharedArrayBuffer:
  // samples go to and from the workers as transferred buffers (moved, not copied).
  lines.push(`SharedArrayBuffer, cross-origin isolated: ${refs.shared}`);
  const row = (what: string, ms: number[], budget: number | null) => {
    const m = med(ms);
    const spread = ms.length > 1 ? ` [${Math.min(...ms).toFixed(0)}-${Math.max(...ms).toFixed(0)}, n=${ms.length}]` : '';
    lines.push(`${what.padEnd(62)} ${m.toFixed(1).padStart(8)} ms${spread.padEnd(18)} = ${(m / refs.emptyFrame).toFixed(1)} empty frames = ${(m / refs.cpu).toFixed(1)} CPU refs${budget ? `; budget ${budget} ms: ${m <= budget ? 'met' : 'NOT met'}` : ''}`);
  };
  return { lines, row };
}

async function demoFigures(): Promise<string[]> {
  if (!existsSync(join(demo, DEMO_COMPLETE_MARKER))) {
    const { writeScenario } = await import('../../electron/host/scenario');
    console.log('making the demo scenario first...');
    await writeScenario(demo, {});
  }
  const app = await openApp({ demoDir: demo, width: 1600, height: 1000 });
  try {
    const page = app.page;
    await page.locator('.trace-row').first().waitFor({ timeout: 180_000 });
    await page.waitForTimeout(500);
    const refs = await references(page);
    const v0 = await view(page);
    const { lines, row } = reporter(refs);
    lines.unshift('--- the demo night (14 sites, 10 h)');
    row(`index the night (decode ${v0.timings.channels} channels in workers)`, [v0.openMs], null);
    row('draw the night overview after decoding (the strips in full)', [v0.overviewMs], 500);
    const box = (await page.locator('canvas.overview-canvas').boundingBox())!;
    await page.mouse.move(box.x + 300, box.y + 400);
    const pans: number[] = [];
    const panWork: number[] = [];
    for (let i = 0; i < 10; i++) {
      pans.push((await page.evaluate(`new Promise((ok) => {
        const t0 = performance.now();
        document.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
        requestAnimationFrame(() => requestAnimationFrame(() => ok(performance.now() - t0)));
      })`)) as number);
      panWork.push((await view(page)).frameMs);
    }
    row('pan one step: the frame\'s drawing work', panWork, 16);
    row('pan one step until painted (two frames of latency included)', pans, null);
    return lines;
  } finally {
    await app.close();
  }
}

async function networkFigures(sites: number, budgetOpen: number, folder: string): Promise<string[]> {
  const root = join(folder, `net${sites}`);
  const t0 = performance.now();
  const sc = networkScenario(sites, 600, [
    { at: 100, north: 3, east: -4, magnitude: 2.6 },
    { at: 280, north: -10, east: 6, magnitude: 2.4 },
    { at: 460, north: 12, east: 9, magnitude: 2.8 },
  ]);
  const every = Array.from({ length: sites }, (_, i) => i);
  await writeNetworkDataset(root, sc, [0, 1, 2].map((event) => ({ event, before: 20, length: 90, sites: every, state: 'todo' as const })));
  console.log(`(${sites} sites generated in ${((performance.now() - t0) / 1000).toFixed(1)} s)`);
  const demoDir = mkdtempSync(join(folder, 'demo-'));
  writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
  const app: RunningApp = await openApp({ demoDir, width: 1600, height: 1000 });
  try {
    const page = app.page;
    await page.goto(app.server.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(root)}#`));
    await page.locator('.trace-row').first().waitFor({ timeout: 180_000 });
    await untilLoaded(page, { readMs: -1, drawMs: -1, rows: 0, channels: 0 });
    await page.waitForTimeout(500);
    const refs = await references(page);
    const { lines, row } = reporter(refs);
    const opened: number[] = [];
    const all: number[] = [];
    const parts = { read: [] as number[], draw: [] as number[], paint: [] as number[] };
    const rparts = { read: [] as number[], draw: [] as number[], paint: [] as number[] };
    const split = (t: Timings, into: typeof parts) => {
      into.read.push(t.readMs);
      into.draw.push(t.rowsDrawMs ?? NaN);
      into.paint.push(t.drawMs);
    };
    let last: Timings = (await view(page)).timings;
    // Open the three events in turn, three rounds (by clicking them in the list).
    for (let round = 0; round < 3; round++) {
      for (let e = 0; e < 3; e++) {
        await page.locator('.event-list li').nth((e + 1) % 3).click();
        last = await untilLoaded(page, last);
        opened.push(last.readMs + last.drawMs);
        all.push(last.allMs ?? NaN);
        split(last, parts);
        await page.waitForTimeout(150);
      }
    }
    const refilter: number[] = [];
    const refilterAll: number[] = [];
    for (const key of ['3', '2', '4', '2', '3', '5', '2']) {
      await page.keyboard.press(key);
      last = await untilLoaded(page, last);
      refilter.push(last.readMs + last.drawMs);
      refilterAll.push(last.allMs ?? NaN);
      split(last, rparts);
      await page.waitForTimeout(100);
    }
    lines.unshift(`--- generated network: ${sites} sites x 3 components x 90 s at 100 Hz (${last.channels} channels, ${last.rows} rows)`);
    row('open an event: until the rows in view are drawn', opened, budgetOpen);
    row('  of which: read, decode and filter them (host and workers)', parts.read, null);
    row('  of which: drawing them, until painted', parts.paint, null);
    row('    (the drawing work itself)', parts.draw, null);
    row('  ... until every row is loaded', all, null);
    row('re-filter: until the rows in view are drawn again', refilter, 50);
    row('  of which: filter them (workers)', rparts.read, null);
    row('  of which: drawing them, until painted', rparts.paint, null);
    row('    (the drawing work itself)', rparts.draw, null);
    row('  ... until every row is filtered', refilterAll, null);
    return lines;
  } finally {
    await app.close();
  }
}

async function main() {
  const only = process.env.DESK_BENCH ?? 'demo,12,60';
  const folder = mkdtempSync(join(tmpdir(), 'daybreak-deskbench-'));
  const out: string[] = [];
  try {
    if (only.includes('demo')) out.push(...await demoFigures());
    if (only.includes('12')) out.push(...await networkFigures(12, 150, folder));
    if (only.includes('60')) out.push(...await networkFigures(60, 400, folder));
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
  console.log(out.join('\n'));
}

main().catch((e) => { console.error(e); process.exit(1); });

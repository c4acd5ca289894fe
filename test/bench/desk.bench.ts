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
 *
 * The interface thread: while an event opens (from the click until its rows are loaded and its
 * magnitude has arrived), while the list is sorted by magnitude (until every event has its ML) and
 * while the review is exported, the longest task Chromium reports (PerformanceObserver 'longtask',
 * tasks of 50 ms or more; 0 when there was none) and the longest time between two
 * requestAnimationFrame callbacks (what the analyst sees as a stall), and, finer than both, the
 * longest stretch between two turns of a message ping running meanwhile (an event-loop probe: a
 * MessageChannel message posted again as soon as it arrives, so any gap is a task or a frame's
 * rendering that held the thread).
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

interface Timings { readMs: number; locateWaitMs?: number; drawMs: number; drawnAt?: number; window?: { filterMs: number[]; packMs: number[] }; rows: number; channels: number; allMs?: number; rowsDrawMs?: number; complete?: boolean }
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

/** Installs the long-task observer and a frame loop in the page (once per page). */
async function watchInterface(page: Page): Promise<void> {
  await page.evaluate(`(() => {
    const s = window.__ui = { tasks: [], gaps: [], last: 0 };
    new PerformanceObserver((l) => { for (const e of l.getEntries()) s.tasks.push([e.startTime, e.duration]); }).observe({ type: 'longtask' });
    const loop = (t) => { if (s.last) s.gaps.push([s.last, t - s.last]); s.last = t; if (s.gaps.length > 20000) s.gaps.splice(0, 10000); requestAnimationFrame(loop); };
    requestAnimationFrame(loop);
    const p = window.__probe = { on: false, max: 0, last: 0, ch: new MessageChannel() };
    p.ch.port1.onmessage = () => { const t = performance.now(); if (t - p.last > p.max) p.max = t - p.last; p.last = t; if (p.on) p.ch.port2.postMessage(0); };
  })()`);
}

/** Starts the event-loop probe and returns the page's time now, ms. */
async function probeStart(page: Page): Promise<number> {
  return (await page.evaluate(`(() => { const p = window.__probe; p.on = true; p.max = 0; p.last = performance.now(); p.ch.port2.postMessage(0); return p.last; })()`)) as number;
}

/** Stops the probe; the longest stretch without a turn since probeStart, ms. */
async function probeStop(page: Page): Promise<number> {
  return (await page.evaluate(`(() => { const p = window.__probe; p.on = false; return p.max; })()`)) as number;
}

/** The longest long task and the longest frame gap that began at or after `since` (page ms). */
async function interfaceSince(page: Page, since: number): Promise<{ task: number; gap: number }> {
  return (await page.evaluate(`(() => {
    const s = window.__ui; let task = 0, gap = 0;
    for (const [t, d] of s.tasks) if (t >= ${since} && d > task) task = d;
    for (const [t, d] of s.gaps) if (t >= ${since} && d > gap) gap = d;
    return { task, gap };
  })()`)) as { task: number; gap: number };
}


/** Waits until the open event's magnitude is the one of `id` (or 10 s passed: no magnitude). */
async function untilMagnitude(page: Page, id: string): Promise<void> {
  for (let i = 0; i < 400; i++) {
    const m = (await page.evaluate('window.daybreakMagnitude && window.daybreakMagnitude()')) as { event: string | null } | null;
    if (m?.event === id) return;
    await page.waitForTimeout(25);
  }
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
    await watchInterface(page);
    const openTask: number[] = [];
    const openProbe: number[] = [];
    const clickToDrawn: number[] = [];
    const openGap: number[] = [];
    const opened: number[] = [];
    const all: number[] = [];
    const parts = { read: [] as number[], draw: [] as number[], paint: [] as number[], wait: [] as number[] };
    const rparts = { read: [] as number[], draw: [] as number[], paint: [] as number[], wait: [] as number[] };
    const split = (t: Timings, into: typeof parts) => {
      into.read.push(t.readMs);
      into.draw.push(t.rowsDrawMs ?? NaN);
      into.paint.push(t.drawMs);
      into.wait.push(t.locateWaitMs ?? 0);
    };
    let last: Timings = (await view(page)).timings;
    // Open the three events in turn, three rounds (by clicking them in the list).
    for (let round = 0; round < 3; round++) {
      for (let e = 0; e < 3; e++) {
        const item = page.locator('.event-list li').nth((e + 1) % 3);
        const id = (await item.getAttribute('data-id'))!;
        const since = await probeStart(page);
        // Clicked in the page, so the click's time and the drawing's are on one clock (the click
        // handler runs inside click(): whatever it does before the window is read counts).
        const clickAt = (await page.evaluate(`(() => { const li = document.querySelectorAll('.event-list li')[${(e + 1) % 3}]; const t = performance.now(); li.click(); return t; })()`)) as number;
        last = await untilLoaded(page, last);
        clickToDrawn.push((last.drawnAt ?? NaN) - clickAt);
        await untilMagnitude(page, id);
        await page.waitForTimeout(150);
        openProbe.push(await probeStop(page));
        const ui = await interfaceSince(page, since);
        openTask.push(ui.task);
        openGap.push(ui.gap);
        opened.push(last.readMs + last.drawMs);
        all.push(last.allMs ?? NaN);
        split(last, parts);
      }
    }
    const refilter: number[] = [];
    const workerFilter: number[] = [];
    const workerPack: number[] = [];
    const refilterAll: number[] = [];
    for (const key of ['3', '2', '4', '2', '3', '5', '2']) {
      await page.keyboard.press(key);
      last = await untilLoaded(page, last);
      refilter.push(last.readMs + last.drawMs);
      workerFilter.push(Math.max(0, ...(last.window?.filterMs ?? [])));
      workerPack.push(Math.max(0, ...(last.window?.packMs ?? [])));
      refilterAll.push(last.allMs ?? NaN);
      split(last, rparts);
      await page.waitForTimeout(100);
    }
    // The list sorted by magnitude: every event's ML worked out (location, read, magnitude).
    let since = await probeStart(page);
    const t0List = performance.now();
    await page.locator('select.sort-key').selectOption('magnitude');
    for (let i = 0; i < 1200; i++) {
      const done = (await page.evaluate(`[...document.querySelectorAll('.event-list li[data-id]')].filter((li) => li.dataset.ml !== '').length`)) as number;
      if (done >= 3) break;
      await page.waitForTimeout(25);
    }
    const listMs = performance.now() - t0List;
    await page.waitForTimeout(150);
    const listProbe = await probeStop(page);
    const listUi = await interfaceSince(page, since);
    await page.locator('select.sort-key').selectOption('time');
    // Export: every event located and its magnitude measured again, QuakeML and CSV written.
    since = await probeStart(page);
    const t0Export = performance.now();
    await page.getByRole('button', { name: 'Export QuakeML + CSV' }).click();
    let exportNote = '';
    for (let i = 0; ; i++) {
      const text = (await page.evaluate(`document.querySelector('span.status')?.textContent ?? ''`)) as string;
      if (text.startsWith('exported')) break;
      // The host refuses requests over 1 MiB (electron/host/server.ts): the 60-site review's QuakeML is larger.
      if (text.startsWith('export failed')) { exportNote = ` (${text})`; break; }
      if (i > 2400) throw new Error(`the export did not finish within 60 s; status: ${text}`);
      await page.waitForTimeout(25);
    }
    const exportMs = performance.now() - t0Export;
    await page.waitForTimeout(150);
    const exportProbe = await probeStop(page);
    const exportUi = await interfaceSince(page, since);
    lines.unshift(`--- generated network: ${sites} sites x 3 components x 90 s at 100 Hz (${last.channels} channels, ${last.rows} rows)`);
    row('open an event: from the click until the rows in view are drawn', clickToDrawn, budgetOpen);
    row('open an event: from the read until the rows in view are drawn', opened, null);
    row('  of which: read, decode and filter them (host and workers)', parts.read, null);
    row('    (meanwhile: waiting for the event\'s location, worker)', parts.wait, null);
    row('  of which: drawing them, until painted', parts.paint, null);
    row('    (the drawing work itself)', parts.draw, null);
    row('  ... until every row is loaded', all, null);
    row('re-filter: until the rows in view are drawn again', refilter, 50);
    row('  of which: filter them (workers)', rparts.read, null);
    row('    (in the slowest worker: filtering)', workerFilter, null);
    row('    (in the slowest worker: trimming and pyramids)', workerPack, null);
    row('  of which: drawing them, until painted', rparts.paint, null);
    row('    (the drawing work itself)', rparts.draw, null);
    row('  ... until every row is filtered', refilterAll, null);
    row('interface thread, opening an event: longest task (probe)', openProbe, null);
    row('interface thread, opening an event: longest task (0: none >= 50 ms)', openTask, null);
    row('interface thread, opening an event: longest gap between frames', openGap, null);
    row(`sort the list by ML (3 events): until every ML is shown`, [listMs], null);
    row('  interface thread meanwhile: longest task (probe)', [listProbe], null);
    row('  interface thread meanwhile: longest task (longtask)', [listUi.task], null);
    row('  interface thread meanwhile: longest gap between frames', [listUi.gap], null);
    row(`export QuakeML + CSV (3 events): until written${exportNote ? ' or refused' : ''}`, [exportMs], null);
    if (exportNote) lines.push(`  ${exportNote.trim()}`);
    row('  interface thread meanwhile: longest task (probe)', [exportProbe], null);
    row('  interface thread meanwhile: longest task (longtask)', [exportUi.task], null);
    row('  interface thread meanwhile: longest gap between frames', [exportUi.gap], null);
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

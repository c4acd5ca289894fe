import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';
import { REVIEW_FILE_NAME } from '../../electron/host/reviewStore';
import { isoFromMicros, microsFromIso } from '../../core/time';
import { readQuakeMl } from '../../core/quakeml';

// A copy of the real records (../shared/data/real-microseismic) so the review file can be written beside it.
const REAL = resolve(__dirname, '..', '..', '..', 'shared', 'data', 'real-microseismic');

interface SavedPick { id: string; phase: string; channel: string; time: string; lower: number; upper: number; onset: string; polarity: string | null; mode: string }
interface Saved { revision: number; events: { id: string; start: string; end: string; state: string; note: string; picks: SavedPick[] }[] }

/** The time the event list shows for a saved event (its earliest P pick, else its earliest pick, else its start), hh:mm:ss. */
function listTime(e: Saved['events'][number]): string {
  const first = (list: SavedPick[]) => list.map((p) => p.time).sort()[0];
  return (first(e.picks.filter((p) => p.phase === 'P')) ?? first(e.picks) ?? e.start).slice(11, 19);
}

describe('editing picks in the review desk (Chromium, browser mode)', () => {
  let app: RunningApp;
  let data: string;
  const reviewFile = () => join(data, REVIEW_FILE_NAME);
  const saved = (): Saved => JSON.parse(readFileSync(reviewFile(), 'utf8'));
  /** Waits until the review file on disk satisfies `ok`. */
  async function savedWhen(ok: (s: Saved) => boolean): Promise<Saved> {
    for (let i = 0; i < 100; i++) {
      if (existsSync(reviewFile())) {
        const s = saved();
        if (ok(s)) return s;
      }
      await new Promise((r) => setTimeout(r, 50));
    }
    await app.page.screenshot({ path: screenshotPath('picking-failure') });
    throw new Error(`review file never reached the expected state (status: ${await app.page.locator('.status').innerText()}): ${existsSync(reviewFile()) ? readFileSync(reviewFile(), 'utf8').slice(0, 400) : 'no file'}`);
  }
  async function plotBox() {
    const box = await app.page.locator('.trace-row:visible .trace-plot').first().boundingBox();
    if (!box) throw new Error('no trace plot on screen');
    return box;
  }
  /** Seconds from the reference at the left edge of the plots, and seconds per pixel, from the axis state. */
  async function viewWindow(): Promise<{ x0: number; x1: number; secondsPerPixel: number }> {
    const v = await app.page.evaluate(() => (window as unknown as { daybreakView: () => { x0: number; x1: number; secondsPerPixel: number } }).daybreakView());
    // The app's scale must match the plot drawn on screen (to a fraction of a pixel across the plot).
    const box = await plotBox();
    expect(Math.abs((v.x1 - v.x0) / v.secondsPerPixel - box.width)).toBeLessThan(1);
    return v;
  }

  beforeAll(async () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
    data = mkdtempSync(join(tmpdir(), 'daybreak-pickdata-'));
    cpSync(REAL, data, { recursive: true });
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir, height: 900 });
    // scan=off: these tests edit by hand; the background scan has its own test.
    await app.page.goto(app.server.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(data)}#`));
    await app.page.locator('.trace-row').first().waitFor({ timeout: 60_000 });
    await app.page.waitForTimeout(300);
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  it('places a P pick at the pointer with R, making the window an event, and saves it at once', async () => {
    const box = await plotBox();
    const { x0, x1 } = await viewWindow();
    const title = await app.page.locator('.sheet-title').innerText();
    const ref = microsFromIso(`${title.slice(0, 19).replace(' ', 'T')}Z`);
    await app.page.mouse.move(box.x + box.width * 0.5, box.y + 8);
    await app.page.keyboard.press('r');
    const s = await savedWhen((x) => x.events.length === 1 && x.events[0].picks.length === 1);
    const p = s.events[0].picks[0];
    expect(p).toMatchObject({ phase: 'P', mode: 'manual', lower: 0.05, upper: 0.05, onset: 'questionable', polarity: 'undecidable' });
    expect(p.channel).toMatch(/\.DPZ$/);
    const expected = ref + ((x0 + x1) / 2) * 1e6;
    // Within one pixel of where the pointer was.
    expect(Math.abs(microsFromIso(p.time) - expected)).toBeLessThan(((x1 - x0) / box.width) * 1e6);
  });

  it('moves a dragged pick by the seconds that match the pixels dragged', async () => {
    const box = await plotBox();
    const { secondsPerPixel } = await viewWindow();
    const before = saved().events[0].picks[0];
    const y = box.y + 20;
    const x = box.x + box.width * 0.5;
    await app.page.mouse.move(x, y);
    await app.page.mouse.down();
    await app.page.mouse.move(x + 30, y, { steps: 3 });
    await app.page.mouse.move(x + 60, y, { steps: 3 });
    await app.page.mouse.up();
    const after = (await savedWhen((s) => s.events[0].picks[0].time !== before.time)).events[0].picks[0];
    const moved = (microsFromIso(after.time) - microsFromIso(before.time)) / 1e6;
    expect(moved).toBeCloseTo(60 * secondsPerPixel, 5);
    expect(after.mode).toBe('manual');
  });

  it('drags one end of the uncertainty bar and leaves the other alone', async () => {
    await app.page.keyboard.press('t'); // zoom to the selected pick: 2 s before, 3 s after
    await app.page.waitForTimeout(200);
    const box = await plotBox();
    const { x0, x1, secondsPerPixel } = await viewWindow();
    const pick = saved().events[0].picks[0];
    const title = await app.page.locator('.sheet-title').innerText();
    const ref = microsFromIso(`${title.slice(0, 19).replace(' ', 'T')}Z`);
    const tp = (microsFromIso(pick.time) - ref) / 1e6;
    const xOf = (t: number) => box.x + ((t - x0) / (x1 - x0)) * box.width;
    // The P pick's band is the vertical (first) band of the row: its bar is at the band's middle.
    const y = box.y + 17;
    await app.page.mouse.move(xOf(tp + pick.upper), y);
    await app.page.mouse.down();
    await app.page.mouse.move(xOf(tp + pick.upper) + 40, y, { steps: 4 });
    await app.page.mouse.up();
    const after = (await savedWhen((s) => s.events[0].picks[0].upper !== pick.upper)).events[0].picks[0];
    // The handle was grabbed where the test computed it to be: within a pixel of it.
    expect(Math.abs(after.upper - (pick.upper + 40 * secondsPerPixel))).toBeLessThan(secondsPerPixel);
    expect(after.lower).toBe(pick.lower);
    expect(after.time).toBe(pick.time);
    await app.page.screenshot({ path: screenshotPath('picking-zoomed') });
  });

  it('sets onset and polarity by key, undoes and redoes, deletes and undoes the delete', async () => {
    await app.page.keyboard.press('e');
    await app.page.keyboard.press('w');
    let s = await savedWhen((x) => x.events[0].picks[0].onset === 'impulsive' && x.events[0].picks[0].polarity === 'positive');
    await app.page.keyboard.press('Control+z');
    s = await savedWhen((x) => x.events[0].picks[0].polarity === 'undecidable');
    expect(s.events[0].picks[0].onset).toBe('impulsive');
    await app.page.keyboard.press('Control+Shift+z');
    await savedWhen((x) => x.events[0].picks[0].polarity === 'positive');
    await app.page.keyboard.press('v');
    await savedWhen((x) => x.events[0].picks.length === 0);
    await app.page.keyboard.press('Control+z');
    s = await savedWhen((x) => x.events[0].picks.length === 1);
    expect(s.events[0].picks[0]).toMatchObject({ onset: 'impulsive', polarity: 'positive' });
  });

  it('places an S on the horizontal under the pointer', async () => {
    const box = await plotBox();
    await app.page.mouse.move(box.x + box.width * 0.8, box.y + box.height * 0.5); // middle band: the first horizontal
    await app.page.keyboard.press('f');
    const s = await savedWhen((x) => x.events[0].picks.some((p) => p.phase === 'S'));
    expect(s.events[0].picks.find((p) => p.phase === 'S')!.channel).toMatch(/\.DPN$/);
  });

  it('adds an event from a window, merges it into the first and splits them apart again', async () => {
    // Open another moment from the overview (a quarter of the way across the strips): no event there yet.
    const ov = await app.page.locator('canvas.overview-canvas').boundingBox();
    await app.page.mouse.click(ov!.x + ov!.width * 0.3, ov!.y + 5);
    await app.page.getByRole('button', { name: 'Make this window an event' }).click();
    let s = await savedWhen((x) => x.events.length === 2);
    const [first, second] = s.events;
    expect(second.picks).toEqual([]);
    await app.page.locator('.event-list li', { hasText: listTime(first) }).click();
    await app.page.getByRole('button', { name: 'Merge next' }).click();
    s = await savedWhen((x) => x.events.length === 1);
    expect(s.events[0]).toMatchObject({ id: first.id, start: first.start, end: second.end });
    expect(s.events[0].picks.length).toBe(first.picks.length);
    await app.page.keyboard.press('g');
    await app.page.getByRole('button', { name: 'Split at centre' }).click();
    s = await savedWhen((x) => x.events.length === 2);
    expect(s.events[0].id).toBe(first.id);
    expect(s.events[1].start).toBe(s.events[0].end);
    // Every pick stays on the side of the split it was on.
    expect(s.events[0].picks.length + s.events[1].picks.length).toBe(first.picks.length);
    // Put it back as it was for the tests that follow.
    await app.page.keyboard.press('Control+z');
    await app.page.keyboard.press('Control+z');
    s = await savedWhen((x) => x.events.length === 2 && x.events[1].picks.length === 0 && x.events[0].end === first.end);
    await app.page.locator('.event-list li', { hasText: listTime(first) }).click();
  });

  it('keeps every edit across a reload and resumes on the event', async () => {
    const before = saved();
    await app.page.reload();
    await app.page.locator('.event-list li.current').waitFor({ timeout: 60_000 });
    await app.page.waitForTimeout(300);
    expect(saved()).toEqual(before);
    expect(await app.page.locator('.event-list li').count()).toBe(before.events.length);
    await app.page.screenshot({ path: screenshotPath('picking-reloaded') });
  });

  it('saves a note while it is typed, and keeps typing going through the redraws that saving causes', async () => {
    const note = app.page.locator('.event-bar input.note');
    await note.click();
    await note.fill('');
    await note.pressSequentially('felt nearby');
    // Saved after a pause in typing, without leaving the field.
    await savedWhen((x) => x.events.some((e) => e.note === 'felt nearby'));
    await note.pressSequentially(', two reports');
    expect(await note.inputValue()).toBe('felt nearby, two reports');
    await savedWhen((x) => x.events.some((e) => e.note === 'felt nearby, two reports'));
    await note.blur();
  });

  it('exports QuakeML and a CSV of the picks with the analyst and agency from the settings', async () => {
    await app.page.getByRole('button', { name: 'Settings' }).click();
    await app.page.locator('dialog#settings input[name=analyst]').fill('Test Analyst');
    await app.page.locator('dialog#settings input[name=agency]').fill('XX');
    await app.page.locator('dialog#settings button[value=save]').click();
    await app.page.getByText('settings saved').waitFor();
    await app.page.getByRole('button', { name: 'Export QuakeML + CSV' }).click();
    await app.page.getByText(/^exported /).waitFor();
    const dir = join(data, 'daybreak-exports');
    const files = readdirSync(dir).sort();
    expect(files.map((f) => f.replace(/\d{8}T\d{6}/, 'STAMP'))).toEqual(['magnitudes-STAMP.csv', 'picks-STAMP.csv', 'review-STAMP.quakeml.xml']);
    const xml = readFileSync(join(dir, files[2]), 'utf8');
    const doc = readQuakeMl(xml, files[2]);
    const review = saved();
    expect(doc.events.map((e) => e.picks.length)).toEqual(review.events.map((e) => e.picks.length));
    expect(doc.events[0].picks.map((p) => isoFromMicros(p.time)).sort()).toEqual(review.events[0].picks.map((p) => p.time).sort());
    expect(xml).toContain('<author>Test Analyst</author>');
    expect(xml).toContain('<agencyID>XX</agencyID>');
    expect(readFileSync(join(dir, files[1]), 'utf8').trim().split('\n')).toHaveLength(2 + review.events[0].picks.length);
    // The real records' StationXML has no responses: no magnitudes, only the caution and the header.
    expect(readFileSync(join(dir, files[0]), 'utf8').trim().split('\n')).toHaveLength(2);
  });

  it('shows every key in the help overlay', async () => {
    await app.page.keyboard.press('?');
    const text = await app.page.locator('dialog#help').innerText();
    for (const k of ['R', 'F', 'V', 'E', 'D', 'C', 'W', 'S', 'X', 'Q', 'A', 'Z', 'T', 'G', 'B', 'Tab', 'Enter', 'Ctrl+Z']) expect(text).toContain(k);
    await app.page.screenshot({ path: screenshotPath('help') });
    await app.page.keyboard.press('Escape');
  });
});

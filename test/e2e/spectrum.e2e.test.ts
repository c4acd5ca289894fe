import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { screenshotPath, type RunningApp } from '../support/browserApp';
import { openDataset } from '../support/openDataset';
import { pollUntil } from '../support/pollUntil';
import { REVIEW_FILE_NAME } from '../../electron/host/reviewStore';
import { smallNight, writeSmallNight } from '../electron/host/cli/scanFixture';
import { EMPTY_REVIEW, addEvent, placePick, serializeReview } from '../../core/review';
import { microsFromIso } from '../../core/time';
import type { SpectrumState } from '../../renderer/spectrum/spectrumPanel';
import { readMiniSeedBuffer } from '../../core/mseed';
import { channelKey } from '../../core/model';
import { numpySpanSpectra, type ReferencePiece } from '../ref/scipy/spectrumPanelReference';
import { relDiff } from '../core/dsp/signals';

// The generator's small night (test/electron/host/cli/scanFixture: five sites on a 10 km ring, an ML 1.6
// and an ML 2.2 earthquake in five minutes). Its noise (core/synth/noise.ts) is a secondary microseism
// band of 0.12-0.35 Hz at 3e-8 m/s RMS (the ring's noise spec, test/core/synth/scenarioFixtures) above a
// site band of 0.5-15 Hz at 5e-9 m/s. The ML 2.2 event's S corner is 17.7 Hz by Brune (1970) with the
// generator's 3 MPa stress drop and 3.41 km/s at its 6 km depth (core/synth/source.ts, DEMO_MODEL); its
// ground velocity spectrum f/(1 + (f/fc)^2)·exp(-π f t*), with t* = 0.016 s over 14 km at Q_S 250 plus the
// ring's κ 0.02 s, is broadest near 6.7 Hz (worked out by hand from those values), so a single spectrum's
// largest bin lies somewhere between 1 and 20 Hz. The review holds that event with a P pick on every
// vertical at the generator's true arrival time.

const VIEW = () => (window as unknown as { daybreakView: () => { x0: number; x1: number } }).daybreakView();

describe('the spectrum panel in the review desk (Chromium, browser mode)', () => {
  let app: RunningApp;
  let data: string;
  let firstP = 0;
  let eventStart = 0;
  const errors: string[] = [];
  const spectrum = (): Promise<SpectrumState> => app.page.evaluate(() => (window as unknown as { daybreakSpectrum: () => SpectrumState }).daybreakSpectrum());

  const until = <T>(what: string, get: () => Promise<T>, ok: (x: T) => boolean) => pollUntil(app.page, 'spectrum-failure', what, get, ok);

  /** Puts the pointer over the middle of a site's row. */
  async function pointAt(station: string): Promise<void> {
    const box = await app.page.locator('.trace-row:visible', { hasText: station }).locator('.trace-plot').boundingBox();
    if (!box) throw new Error(`row ${station} is not on screen`);
    await app.page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
  }

  beforeAll(async () => {
    data = mkdtempSync(join(tmpdir(), 'daybreak-spectrum-'));
    const sc = smallNight();
    const truth = writeSmallNight(data, sc);
    const origin = sc.events[1].origin;
    eventStart = origin - 5e6;
    const channels = readdirSync(join(data, 'waveforms')).filter((f) => f.endsWith('.mseed')).map((f) => f.split('.').slice(0, 4).join('.'));
    let doc = EMPTY_REVIEW;
    const r = addEvent(doc, eventStart, origin + 25e6);
    doc = r.doc;
    for (const a of truth.filter((x) => x.wave === 'P' && x.timeMicros > origin && x.timeMicros < origin + 20e6)) {
      const z = channels.filter((c) => c.split('.')[1] === a.station && /Z$/.test(c)).sort()[0];
      const t = microsFromIso(a.recordedTime);
      doc = placePick(doc, r.eventId, { phase: 'P', channel: z, time: t }).doc;
      if (!firstP || t < firstP) firstP = t;
    }
    writeFileSync(join(data, REVIEW_FILE_NAME), serializeReview(doc));
    app = await openDataset(data, { width: 1400, height: 900 }, errors);
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  /** The view's span in µs (the sheet's reference time is the event's start, where it opened). */
  async function viewSpan(): Promise<[number, number]> {
    const v = await app.page.evaluate(VIEW);
    return [eventStart + Math.round(v.x0 * 1e6), eventStart + Math.round(v.x1 * 1e6)];
  }

  /** The segments of a channel in the dataset's files, as core/mseed reads them in Node. */
  function rawPieces(channel: string): ReferencePiece[] {
    const files = readdirSync(join(data, 'waveforms')).filter((f) => f.startsWith(`${channel}.`));
    expect(files.length).toBeGreaterThan(0);
    return files.flatMap((f) => readMiniSeedBuffer(new Uint8Array(readFileSync(join(data, 'waveforms', f))), f).channels
      .filter((c) => channelKey(c.id) === channel).flatMap((c) => c.segments.map((g) => ({ start: g.start, sampleRate: g.sampleRate, samples: g.samples }))));
  }

  /** Median of signal/noise over the drawn bins in [f0, f1] Hz. */
  function medianRatio(c: SpectrumState['components'][number], f0: number, f1: number): number {
    const r: number[] = [];
    c.drawn.hz.forEach((f, i) => {
      const a = c.drawn.signal[i];
      const b = c.drawn.noise[i];
      if (f >= f0 && f <= f1 && a !== null && b !== null && b > 0) r.push(a / b);
    });
    r.sort((x, y) => x - y);
    return r[r.length >> 1];
  }

  it('N over a row opens the spectra of its components over the span in view, drawn as numpy computes them from the raw samples: the earthquake peaks above 1 Hz, the noise before the first pick in the microseism band', async () => {
    await pointAt('T00');
    await app.page.keyboard.press('n');
    const s = await until('spectrum drawn', spectrum, (x) => x.open && x.draws >= 1);
    await app.page.waitForTimeout(150);
    await app.page.screenshot({ path: screenshotPath('spectrum-open-dark') });
    await expect(app.page.locator('.spectrum-panel').isVisible()).resolves.toBe(true);
    expect(s.site).toBe('XX.T00');
    expect(s.window).toBe('Hann');
    await expect(app.page.locator('.spectrum-head').innerText()).resolves.toMatch(/Hann window, 4096-point FFT; amplitude in counts/);
    const span = await viewSpan();
    expect(s.spans!.signal).toEqual(span);
    // The noise: as long as the view, ending 0.5 s before the event's first pick.
    expect(s.spans!.noise).toEqual([firstP - 500_000 - (span[1] - span[0]), firstP - 500_000]);
    expect(s.components.map((c) => c.channel.split('.')[3])).toEqual(['HHZ', 'HHN', 'HHE']);
    for (const c of s.components) {
      // 30 s at 100 Hz: 3000 samples in each span, padded to 4096.
      expect([c.samples, c.noiseSamples, c.fftLength]).toEqual([3000, 3000, 4096]);
      // The generator's noise is loudest in its microseism band (0.12-0.35 Hz; one 0.024 Hz bin of slack
      // for the band-pass's skirts); the earthquake's ground velocity peaks above 1 Hz.
      expect(c.noisePeakHz).toBeGreaterThan(0.12 - 0.025);
      expect(c.noisePeakHz).toBeLessThan(0.35 + 0.025);
      expect(c.peakHz).toBeGreaterThan(1);
      expect(c.peakHz).toBeLessThan(20);
      // Above 1 Hz the earthquake stands far above the noise; in the microseism band the two spans are
      // alike (both hold the same microseism).
      expect(medianRatio(c, 1, 20)).toBeGreaterThan(30);
      const low = medianRatio(c, 0.12, 0.35);
      expect(low).toBeGreaterThan(1 / 3);
      expect(low).toBeLessThan(3);
    }
    // The values drawn are numpy's spectra of the same raw samples, read here from the miniSEED files
    // by core/mseed (Node) and cut and transformed by test/ref/scipy/spectrum_panel_reference.py.
    const z = s.components[0];
    const ref = numpySpanSpectra([{ pieces: rawPieces(z.channel), span: s.spans!.signal }, { pieces: rawPieces(z.channel), span: s.spans!.noise }]);
    for (const [drawn, r] of [[z.drawn.signal, ref[0]!], [z.drawn.noise, ref[1]!]] as const) {
      expect(r.N).toBe(4096);
      expect(z.drawn.hz).toEqual(r.frequencies.slice(1));
      expect(drawn.every((y) => y !== null)).toBe(true);
      expect(relDiff(drawn as number[], r.amplitudes.slice(1))).toBeLessThan(1e-12);
    }
    expect(z.peakHz).toBe(ref[0]!.peak);
    expect(z.noisePeakHz).toBe(ref[1]!.peak);
    console.log(`spectrum of T00 read, computed and drawn in ${s.ms.toFixed(1)} ms; (Hz): ${s.components.map((c) => `${c.channel.split('.')[3]} peak ${c.peakHz.toFixed(2)}, noise peak ${c.noisePeakHz.toFixed(3)}, median signal/noise 1-20 Hz ${medianRatio(c, 1, 20).toFixed(0)}, 0.12-0.35 Hz ${medianRatio(c, 0.12, 0.35).toFixed(2)}`).join('; ')}`);
    expect(s.band).toEqual([1, 20]);
    // The pointer over a plot reads out the frequency and both amplitudes there.
    const plot = await app.page.locator('.spectrum-plot .u-over').first().boundingBox();
    await app.page.mouse.move(plot!.x + plot!.width * 0.75, plot!.y + plot!.height / 2);
    await expect(app.page.locator('.spectrum-readout').innerText()).resolves.toMatch(/^HHZ \d+(\.\d+)? Hz: signal [\d.e+-]+, noise [\d.e+-]+ counts$/);
    await app.page.screenshot({ path: screenshotPath('spectrum-readout') });
  });

  it('follows a pan and a zoom of the view, and the filter choice (the shaded band)', async () => {
    const before = await spectrum();
    await app.page.keyboard.press('ArrowRight');
    const panned = await viewSpan();
    let s = await until('spectrum after the pan', spectrum, (x) => x.draws > before.draws && x.spans!.signal[0] === panned[0]);
    expect(s.spans!.signal).toEqual(panned);
    // Zoomed in by the wheel over the row shown (the panel opened in the half away from it): a shorter
    // span, a shorter noise span, a shorter FFT.
    const box = await app.page.locator('.trace-row:visible', { hasText: 'T00' }).locator('.trace-plot').boundingBox();
    await app.page.mouse.move(box!.x + box!.width * 0.5, box!.y + box!.height / 2);
    await app.page.mouse.wheel(0, -400);
    await app.page.waitForTimeout(300);
    const zoomed = await viewSpan();
    expect(zoomed[1] - zoomed[0]).toBeLessThan(panned[1] - panned[0]);
    s = await until('spectrum after the zoom', spectrum, (x) => x.spans!.signal[0] === zoomed[0] && x.spans!.signal[1] === zoomed[1]);
    expect(s.spans!.noise[1] - s.spans!.noise[0]).toBe(zoomed[1] - zoomed[0]);
    expect(s.components[0].fftLength).toBeLessThan(4096);
    expect(s.site).toBe('XX.T00');
    await app.page.keyboard.press('4');
    s = await until('band of the 5-40 Hz preset', spectrum, (x) => x.band?.[0] === 5);
    expect(s.band).toEqual([5, 40]);
    await expect(app.page.locator('.spectrum-legend').innerText()).resolves.toMatch(/traces\u2019 filter 5\u201340 Hz/);
    await app.page.keyboard.press('1');
    s = await until('no band as recorded', spectrum, (x) => x.band === null);
    await expect(app.page.locator('.spectrum-legend').innerText()).resolves.toMatch(/traces unfiltered/);
    await app.page.keyboard.press('2');
    await until('band of the 1-20 Hz preset', spectrum, (x) => x.band?.[0] === 1);
  });

  it('closes with N again and with Escape; Escape with the help open closes only the help', async () => {
    await app.page.keyboard.press('n');
    await until('closed by N', spectrum, (x) => !x.open);
    await expect(app.page.locator('.spectrum-panel').isVisible()).resolves.toBe(false);
    await pointAt('T02');
    await app.page.keyboard.press('n');
    let s = await until('open on T02', spectrum, (x) => x.open && x.site === 'XX.T02');
    await app.page.keyboard.press('?');
    await expect(app.page.locator('dialog#help').isVisible()).resolves.toBe(true);
    await expect(app.page.locator('dialog#help').innerText()).resolves.toMatch(/N\s+amplitude spectrum of the site under the pointer/);
    await app.page.screenshot({ path: screenshotPath('spectrum-help') });
    await app.page.keyboard.press('Escape');
    await expect(app.page.locator('dialog#help').isVisible()).resolves.toBe(false);
    s = await spectrum();
    expect(s.open).toBe(true);
    await app.page.keyboard.press('Escape');
    await until('closed by Escape', spectrum, (x) => !x.open);
    await expect(app.page.locator('.spectrum-panel').isVisible()).resolves.toBe(false);
  });

  it('says so when the spans reach before the data: browsing from the night\u2019s first seconds, no pick, noise before the span', async () => {
    const canvas = await app.page.locator('.overview-canvas').boundingBox();
    await app.page.mouse.click(canvas!.x + 2, canvas!.y + canvas!.height / 2);
    await app.page.locator('.event-bar', { hasText: 'Browsing' }).waitFor();
    await app.page.waitForTimeout(300);
    await pointAt('T00');
    await app.page.keyboard.press('n');
    const s = await until('spectrum while browsing', spectrum, (x) => x.open && x.spans?.noiseBefore === 'span');
    const span = await app.page.evaluate(VIEW);
    // The sheet opened 20 s before the moment clicked: the noise span, as long, lies wholly before the data.
    expect(s.spans!.noise[1]).toBe(s.spans!.signal[0]);
    expect(s.spans!.signal[1] - s.spans!.signal[0]).toBe(Math.round((span.x1 - span.x0) * 1e6));
    expect(s.components.every((c) => c.noiseSamples === 0 && c.drawn.noise.every((y) => y === null))).toBe(true);
    // The signal is the part of the span after the data's start.
    expect(s.components[0].samples).toBeLessThan(((s.spans!.signal[1] - s.spans!.signal[0]) / 1e6) * 100 - 1000);
    const legend = await app.page.locator('.spectrum-legend').innerText();
    expect(legend).toMatch(/just before the span/);
    expect(legend).toMatch(/signal: only \d+\.\d s without a gap on HHZ, HHN, HHE/);
    expect(legend).toMatch(/noise: no data in the noise span/);
    await app.page.screenshot({ path: screenshotPath('spectrum-browsing') });
    await app.page.keyboard.press('Escape');
    await until('closed', spectrum, (x) => !x.open);
  });

  it('draws again in the light theme when the theme is switched while it is open', async () => {
    await pointAt('T00');
    await app.page.keyboard.press('n');
    const before = await until('open again', spectrum, (x) => x.open && x.site === 'XX.T00');
    await app.page.getByRole('button', { name: 'Theme' }).click();
    await until('drawn again', spectrum, (x) => x.draws > before.draws);
    await app.page.waitForTimeout(150);
    await app.page.screenshot({ path: screenshotPath('spectrum-open-light') });
    await app.page.keyboard.press('n');
    expect(errors).toEqual([]);
  });
});

/**
 * Looks at the generated demo scenario by eye: for a few events, reads the written miniSEED files
 * back with the project's reader and plots three stations' components around the true arrivals
 * (band-passed 1-20 Hz, as an analyst would first look), plus one unfiltered view.
 * Run: npx tsx test/support/plotScenarioEvents.ts [EVENT_ID...]   (after `daybreak demo`)
 * Writes test/output/scenario-<event>.png.
 */
import { mkdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { butterworth } from '../../core/dsp/butterworth';
import { sosfilt } from '../../core/dsp/sosfilt';
import { collectBuffer } from '../../core/mseed/collect';
import { isoFromMicros } from '../../core/time';
import type { Truth } from '../../core/synth/truth';
import { plotPng, type PlotTrace } from './plotTraces';

const root = join(import.meta.dirname, '..', '..', 'samples', 'generated');
const outDir = join(import.meta.dirname, '..', 'output');

async function channelSamples(key: string, day: string, at: number): Promise<{ start: number; rate: number; samples: Float64Array } | null> {
  let bytes: Buffer;
  try {
    bytes = await readFile(join(root, 'waveforms', `${key}.${day}.mseed`));
  } catch {
    return null;
  }
  const r = collectBuffer(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.length), key);
  const seg = r.channels[0]?.segments.find((sg) => sg.start <= at && sg.end >= at);
  if (!seg) return null;
  return { start: seg.start, rate: seg.sampleRate, samples: Float64Array.from(seg.samples as ArrayLike<number>) };
}

async function main(): Promise<void> {
  await mkdir(outDir, { recursive: true });
  const truth = JSON.parse(await readFile(join(root, 'truth.json'), 'utf8')) as Truth;
  const ids = process.argv.slice(2);
  const events = truth.events.filter((e) => ids.length === 0 ? ['eq-08', 'eq-2317a', 'blast-2041', 'reg-0233'].includes(e.id) : ids.includes(e.id));
  for (const ev of events) {
    const origin = ev.origin.timeMicros;
    const day = isoFromMicros(origin).slice(0, 10);
    const ps = ev.arrivals.filter((a) => a.wave === 'P' && !a.inGap).sort((a, b) => a.epicentralKm - b.epicentralKm);
    const picks = [ps[0], ps[Math.floor(ps.length / 2)], ps[ps.length - 1]];
    const sMax = Math.max(...picks.map((p) => ev.arrivals.find((a) => a.station === p.station && a.wave === 'S')!.timeMicros));
    const from = (ps[0].timeMicros - origin) / 1e6 - 5;
    const to = (sMax - origin) / 1e6 + (ev.id.startsWith('reg') ? 80 : 30);
    const panels = [];
    for (const filtered of [true, false]) {
      const traces: PlotTrace[] = [];
      for (const p of picks) {
        const s = ev.arrivals.find((a) => a.station === p.station && a.wave === 'S')!;
        for (const comp of ['Z', 'N', 'E', '1', '2']) {
          for (const [loc, band] of [['00', 'HH'], ['00', 'BH'], ['', 'EH']]) {
            const key = `XX.${p.station}.${loc}.${band}${comp}`;
            const d = await channelSamples(key, day, p.timeMicros);
            if (!d) continue;
            const x = filtered ? sosfilt(butterworth(4, [1, Math.min(20, 0.45 * d.rate)], 'bandpass', d.rate), d.samples) : d.samples;
            traces.push({
              label: `${key} ${p.epicentralKm.toFixed(0)} km`, t0: (d.start - origin) / 1e6, dt: 1 / d.rate, values: x,
              marks: [
                { t: (p.timeMicros - origin) / 1e6, label: `${p.phase} ${p.polarity === 'positive' ? 'up' : 'down'} snr ${p.snr}`, color: '#c00' },
                { t: (s.timeMicros - origin) / 1e6, label: `${s.phase} snr ${s.snr}`, color: '#06c' },
              ],
            });
          }
        }
      }
      panels.push({ title: `${ev.id} ${ev.type} ML ${ev.magnitude.value} depth ${ev.origin.depthKm} km, ${isoFromMicros(origin)}; ${filtered ? 'band-pass 1-20 Hz' : 'raw counts'}; seconds after origin`, from, to, traces });
    }
    const png = join(outDir, `scenario-${ev.id}.png`);
    await plotPng(panels, png);
    console.log(png);
  }
}

await main();

import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseStationXml } from '../../../core/stationxml';
import { demoScenario } from '../../../core/synth/demo';
import { microsFromIso } from '../../../core/time';
import { writeScenario } from '../../../electron/host/scenario';
import { DEMO_COMPLETE_MARKER } from '../../../electron/host/service';
import { libmseedDecode } from '../../ref/libmseed';

// 75 s of the demo night around the explosion: every station, every channel.
const full = demoScenario();
const start = microsFromIso('2026-11-14T20:40:40Z');
const sc = { ...full, start, end: start + 75e6, events: full.events.filter((e) => e.origin > start && e.origin < start + 50e6) };
const dirs: string[] = [];
const fresh = () => {
  const d = mkdtempSync(join(tmpdir(), 'daybreak-scenario-'));
  dirs.push(d);
  return d;
};
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

describe('writeScenario', () => {
  it('writes waveforms, StationXML, model, truth and, last, the completion marker, reporting progress up to 1', async () => {
    const root = fresh();
    const seen: number[] = [];
    const r = await writeScenario(root, { scenario: sc, onProgress: (f) => seen.push(f) });
    expect(readdirSync(root).sort()).toEqual(['model.json', DEMO_COMPLETE_MARKER, 'stations.xml', 'truth.json', 'waveforms'].sort());
    const wave = readdirSync(join(root, 'waveforms'));
    const channels = sc.stations.reduce((n, s) => n + s.channels.length, 0);
    expect(wave).toHaveLength(channels);
    expect(r.files).toBe(channels + 5);
    expect(seen[seen.length - 1]).toBe(1);
    expect(seen.every((f, i) => i === 0 || f >= seen[i - 1])).toBe(true);
    const inv = parseStationXml(readFileSync(join(root, 'stations.xml'), 'utf8'), 'stations.xml');
    expect(inv.networks[0].stations).toHaveLength(sc.stations.length);
    const truth = JSON.parse(readFileSync(join(root, 'truth.json'), 'utf8'));
    expect(truth.events.map((e: { id: string }) => e.id)).toEqual(['blast-2041']);
    expect(truth.events[0].arrivals).toHaveLength(2 * sc.stations.length);
    // libmseed 2.19 reads a written file to its end without error.
    const one = libmseedDecode(join(root, 'waveforms', wave[0]));
    expect(one.error).toBeNull();
    expect(one.segments[0].start).toBe(start);
  });

  it('writes the same bytes in worker threads as in the calling thread', async () => {
    const a = fresh(), b = fresh();
    const ra = await writeScenario(a, { scenario: sc, workers: 2 });
    const rb = await writeScenario(b, { scenario: sc, workers: 0 });
    expect(ra.workers).toBe(2);
    expect(rb.workers).toBe(0);
    for (const f of readdirSync(join(a, 'waveforms'))) {
      expect(readFileSync(join(a, 'waveforms', f)).equals(readFileSync(join(b, 'waveforms', f)))).toBe(true);
    }
    expect(readFileSync(join(a, 'truth.json'), 'utf8')).toBe(readFileSync(join(b, 'truth.json'), 'utf8'));
    expect(ra.waveformBytes).toBe(rb.waveformBytes);
  });
});

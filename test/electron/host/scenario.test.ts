import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseStationXml } from '../../../core/stationxml';
import { demoScenario, GENERATOR_VERSION } from '../../../core/synth/demo';
import { microsFromIso } from '../../../core/time';
import { writeScenario } from '../../../electron/host/scenario';
import { DEMO_COMPLETE_MARKER, demoIsCurrent, HostService } from '../../../electron/host/service';
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

  it('marks the folder with the generator version; a folder of an earlier generator is written again when the demo is asked for', async () => {
    const root = fresh();
    await writeScenario(root, { scenario: sc, workers: 0 });
    expect(JSON.parse(readFileSync(join(root, DEMO_COMPLETE_MARKER), 'utf8'))).toMatchObject({ seed: sc.seed, generator: GENERATOR_VERSION });
    expect(demoIsCurrent(root)).toBe(true);
    // The marker of an earlier generator (version 1 wrote none), one that cannot be read, none at all.
    writeFileSync(join(root, DEMO_COMPLETE_MARKER), JSON.stringify({ scenario: sc.name, seed: sc.seed, generatedSeconds: 4.2 }));
    expect(demoIsCurrent(root)).toBe(false);
    const service = new HostService({ mode: 'browser', version: 'test', demoRoot: root, userDir: fresh(), generateDemo: (r) => writeScenario(r, { scenario: sc, workers: 0 }).then(() => undefined) });
    const state = async (name: 'demo.status' | 'demo.ensure') => {
      const r = await service.handle(name, {});
      if (!r.ok) throw new Error(r.message);
      return r.value.state;
    };
    expect(await state('demo.status')).toBe('missing');
    expect(await state('demo.ensure')).toBe('generating');
    for (let i = 0; i < 200 && (await state('demo.status')) === 'generating'; i++) await new Promise((r) => setTimeout(r, 50));
    expect(await state('demo.status')).toBe('ready');
    expect(demoIsCurrent(root)).toBe(true);
    writeFileSync(join(root, DEMO_COMPLETE_MARKER), '{"seed": 1, "gen');
    expect(demoIsCurrent(root)).toBe(false);
    rmSync(join(root, DEMO_COMPLETE_MARKER));
    expect(demoIsCurrent(root)).toBe(false);
    // A marker without a seed was not written by the generator (a folder prepared by hand): taken as it is.
    writeFileSync(join(root, DEMO_COMPLETE_MARKER), '{}');
    expect(demoIsCurrent(root)).toBe(true);
  });
});

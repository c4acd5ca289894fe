/**
 * Location benchmark.
 *
 * - firstArrival (core/location/travelTime.ts) on the default 3-layer model, mixed P/S, distances
 *   0-300 km, depths -1 to 29 km, against the simplest possible travel time measured in the same run:
 *   the straight ray in a half-space, sqrt(x^2 + z^2) / v, as a floor.
 * - locate (core/location/geiger.ts) of an event with 30 phases (15 stations, P and S, Gaussian
 *   pick errors) once the model's start tables exist, against the review desk's budget of 20 ms.
 *
 * Printed: calls per second (best of several passes) and ms per location, CPU and wall time, with the
 * machine's load average (the build machine's two cores are shared).
 *
 *   npm run bench -- location
 */
import { loadavg } from 'node:os';
import { firstArrival, firstArrivalInto, type TravelTime } from '../../core/location/travelTime';
import { locate, type LocationPick, type LocationStation } from '../../core/location/geiger';
import { DEFAULT_MODEL } from '../../core/location/velocityModel';

const N = 1_000_000;
const PASSES = 5;

function bestRate(f: () => number): number {
  let best = 0;
  for (let p = 0; p < PASSES; p++) {
    const c0 = process.cpuUsage();
    const s = f();
    const c = process.cpuUsage(c0);
    if (!(s > 0)) throw new Error('no result');
    best = Math.max(best, N / ((c.user + c.system) / 1e6));
  }
  return best;
}

function main(): void {
  console.log(`load average ${loadavg()[0].toFixed(1)}`);
  const out: TravelTime = { time: 0, phase: '', takeoffDeg: 0, incidenceDeg: 0, slownessH: 0, dTdDepth: 0 };
  const layered = bestRate(() => {
    let s = 0;
    for (let i = 0; i < N; i++) s += firstArrivalInto(out, DEFAULT_MODEL, i & 1 ? 'S' : 'P', (i % 300) + 0.5, (i % 41) * 0.73 - 1, 0.3).time;
    return s;
  });
  const straight = bestRate(() => {
    let s = 0;
    for (let i = 0; i < N; i++) {
      const x = (i % 300) + 0.5;
      const z = (i % 41) * 0.73 - 1 + 0.3;
      s += Math.sqrt(x * x + z * z) / (i & 1 ? 3.36 : 5.8);
    }
    return s;
  });
  console.log(`firstArrival, 3 layers: ${(layered / 1e6).toFixed(2)} M calls/CPU-s (${(1e6 / layered).toFixed(3)} us per call)`);
  console.log(`reference, straight ray in a half-space: ${(straight / 1e6).toFixed(1)} M calls/CPU-s; ratio ${(straight / layered).toFixed(0)}x`);

  const stations: LocationStation[] = Array.from({ length: 15 }, (_, i) => ({
    key: `XX.S${i}`, latDeg: 46 + 0.25 * Math.cos(i * 0.9) * (1 + 0.3 * (i % 3)), lonDeg: 8 + 0.35 * Math.sin(i * 0.9) * (1 + 0.3 * (i % 3)), elevKm: 0.1 * i,
  }));
  let seed = 12345;
  const rnd = (): number => ((seed = (seed * 1103515245 + 12345) >>> 0) / 4294967296);
  const picks: LocationPick[] = [];
  for (const s of stations) {
    const dLat = (s.latDeg - 46.03) * 111.2;
    const dLon = (s.lonDeg - 8.04) * 111.2 * Math.cos(46 * Math.PI / 180);
    for (const w of ['P', 'S'] as const) {
      const sigma = w === 'P' ? 0.05 : 0.1;
      const g = Math.sqrt(-2 * Math.log(1 - rnd())) * Math.cos(2 * Math.PI * rnd());
      const t = firstArrival(DEFAULT_MODEL, w, Math.hypot(dLat, dLon), 8, s.elevKm).time + sigma * g;
      picks.push({ stationKey: s.key, wave: w, time: 1_764_633_600_000_000 + Math.round(t * 1e6), uncertaintyS: sigma });
    }
  }
  const t0 = performance.now();
  const first = locate(stations, picks);
  if (!first.ok) throw new Error(first.message);
  console.log(`locate, first call (builds the start tables): ${(performance.now() - t0).toFixed(1)} ms wall`);
  const runs = 50;
  const c0 = process.cpuUsage();
  const w0 = performance.now();
  for (let i = 0; i < runs; i++) locate(stations, picks);
  const c = process.cpuUsage(c0);
  const wall = (performance.now() - w0) / runs;
  const cpu = (c.user + c.system) / 1000 / runs;
  console.log(`locate, 30 phases: ${cpu.toFixed(2)} ms CPU, ${wall.toFixed(2)} ms wall per event (budget 20 ms); ${first.value.iterations} iterations`);
}

main();

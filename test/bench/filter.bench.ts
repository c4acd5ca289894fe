/**
 * Filter benchmark: a 4-section Butterworth band-pass (order 4, 1-20 Hz at 100 Hz) over one
 * channel-day (8,640,000 float64 samples), causal (sosfilt) and zero-phase (sosfiltfilt), in
 * Daybreak's core/dsp and in scipy.signal (test/ref/scipy/bench_filter.py, python3) on the same
 * samples and the same sections, in the same run. The sides alternate call by call, so a busy
 * machine slows both alike, and the best of the rounds is reported; the outputs are compared.
 *
 * Two clocks: CPU time of the process (Node's process.cpuUsage, python's time.process_time), which a
 * machine shared with other jobs disturbs least, and wall time.
 *
 * Three ways of calling, each timed on both sides where both have it:
 * - the whole day in one call with a new output array (scipy's only way; Daybreak's default);
 * - the whole day into a reused output array (Daybreak's `out` option; scipy has none);
 * - the day in 10-minute pieces (60,000 samples), each call returning a new array that is dropped
 *   before the next, as a streaming caller without a buffer of its own works (the scan filters
 *   10-minute chunks with the state carried, but into a buffer it reuses; the desk filters event
 *   windows into new arrays): causal with the state carried (scipy: `zi`), zero-phase piece by
 *   piece on its own.
 * A new output array of a whole day (69 MB) is paid for in first-touch page faults, one per 4 KB
 * page, and on the project's build machine (a virtual machine) each costs about 3-4 us: about as much
 * as filtering the day through four sections. numpy asks the kernel for huge pages for its large
 * arrays (madvise MADV_HUGEPAGE), which JavaScript cannot do; switched off (numpy's
 * _set_madvise_hugepage(False)), scipy's sosfilt of this day took about 45 ms longer where we
 * measured (148 ms instead of 104 ms, CPU time, at load 8). So the bench also times the first touch of
 * a new day-long Float64Array alone and prints it beside the filters. The pieces do not escape it
 * either: numpy frees a dropped piece at once and the next one reuses its memory, but V8 frees
 * dropped arrays only at its next garbage collection, so Daybreak's new pieces keep landing on new
 * pages (about 14,000 page faults per day of pieces where we counted, against about 17,000 for one
 * day-long array). What avoids the
 * cost is an output array that is reused, as the scan's trigger stream does (core/scan/triggerStream).
 * To compare a new output array on equal terms, scipy's whole-day calls are also timed with numpy's
 * huge pages switched off (its `_set_madvise_hugepage(False)`), so that both sides pay the same
 * first-touch faults; that ratio is printed beside the others.
 *
 * Printed: samples/s of each, the ratios Daybreak/scipy (target: >= 1.0 for causal and zero-phase)
 * and how far the outputs agree.
 *
 *   npm run bench -- filter
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { butterworth, sosfilt, sosfiltfilt } from '../../core/dsp';

const here = dirname(fileURLToPath(import.meta.url));
const SAMPLES = 8_640_000;
const RATE = 100;
const ROUNDS = 11;
/** Samples per piece in the piecewise runs: 10 minutes at 100 Hz, the scan's chunk length. */
const PIECE = 60_000;

/** Present when node runs with --expose-gc (bin/bench.mjs does). */
const gc = (globalThis as { gc?: () => void }).gc;

/** A seeded channel-day: offset, AR(1) background noise, a 0.2 Hz microseism and decaying bursts. */
function channelDay(): Float64Array {
  let s = 12345;
  const rnd = () => {
    s ^= s << 13; s >>>= 0; s ^= s >>> 17; s ^= s << 5; s >>>= 0;
    return s / 4294967296 - 0.5;
  };
  const x = new Float64Array(SAMPLES);
  let ar = 0;
  let burst = 0;
  for (let i = 0; i < SAMPLES; i++) {
    ar = 0.9 * ar + 200 * rnd();
    if (i % 360_000 === 180_000) burst = 50_000;
    burst = burst > 1 ? burst * 0.9995 : 0;
    x[i] = 1500 + ar + 300 * Math.sin((2 * Math.PI * 0.2 * i) / RATE) + burst * rnd();
  }
  return x;
}

function bytes(a: Float64Array): Uint8Array {
  return new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
}

interface Timing { wall: number; cpu: number }
const bestOf = (a: Timing, b: Timing): Timing => ({ wall: Math.min(a.wall, b.wall), cpu: Math.min(a.cpu, b.cpu) });
const NONE: Timing = { wall: Infinity, cpu: Infinity };

/** Seconds of one call of f, by the wall clock and by this process's CPU time. */
function time(f: () => void): Timing {
  gc?.();
  const c = process.cpuUsage();
  const t = performance.now();
  f();
  const wall = (performance.now() - t) / 1000;
  const cpu = process.cpuUsage(c);
  return { wall, cpu: (cpu.user + cpu.system) / 1e6 };
}

async function main(): Promise<void> {
  const x = channelDay();
  const sos = butterworth(4, [1, 20], 'bandpass', RATE);
  const dir = mkdtempSync(join(tmpdir(), 'daybreak-filter-bench-'));
  try {
    writeFileSync(join(dir, 'x.f64'), bytes(x));
    writeFileSync(join(dir, 'sos.f64'), bytes(sos));
    const py = spawn('python3', [join(here, '..', 'ref', 'scipy', 'bench_filter.py'), join(dir, 'x.f64'), join(dir, 'sos.f64')], { stdio: ['pipe', 'pipe', 'inherit'] });
    const lines = createInterface({ input: py.stdout })[Symbol.asyncIterator]();
    const ask = async (cmd: string): Promise<string> => {
      if (cmd) py.stdin.write(`${cmd}\n`);
      const r = await lines.next();
      if (r.done) throw new Error(`python3 bench_filter.py ended before answering "${cmd}"`);
      return r.value;
    };
    const askTime = async (cmd: string): Promise<Timing> => {
      const [wall, cpu] = (await ask(cmd)).split(' ').map(Number);
      return { wall, cpu };
    };
    await ask('');
    const versions = JSON.parse(await ask('versions')) as { scipy: string; numpy: string };

    let causal: Float64Array = new Float64Array(0);
    let zero: Float64Array = new Float64Array(0);
    let touched: Float64Array = new Float64Array(0);
    const reused = new Float64Array(SAMPLES);
    const t = {
      jsCausal: NONE, jsCausalReused: NONE, pyCausal: NONE, jsZero: NONE, jsZeroReused: NONE, pyZero: NONE,
      jsCausalPieces: NONE, pyCausalPieces: NONE, jsZeroPieces: NONE, pyZeroPieces: NONE, touch: NONE,
      pyCausalSmallPages: NONE, pyZeroSmallPages: NONE, pyCausalInPlace: NONE,
    };
    const causalPieces = (): void => {
      const state = new Float64Array(sos.length / 3);
      for (let a = 0; a < SAMPLES; a += PIECE) sosfilt(sos, x.subarray(a, a + PIECE), { state });
    };
    const zeroPieces = (): void => {
      for (let a = 0; a < SAMPLES; a += PIECE) sosfiltfilt(sos, x.subarray(a, a + PIECE));
    };
    for (let r = 0; r < ROUNDS; r++) {
      t.jsCausal = bestOf(t.jsCausal, time(() => { causal = sosfilt(sos, x); }));
      t.pyCausal = bestOf(t.pyCausal, await askTime('causal'));
      t.jsCausalReused = bestOf(t.jsCausalReused, time(() => { sosfilt(sos, x, { out: reused }); }));
      t.pyCausalInPlace = bestOf(t.pyCausalInPlace, await askTime('causal_inplace'));
      t.jsZero = bestOf(t.jsZero, time(() => { zero = sosfiltfilt(sos, x); }));
      t.pyZero = bestOf(t.pyZero, await askTime('zerophase'));
      t.jsZeroReused = bestOf(t.jsZeroReused, time(() => { sosfiltfilt(sos, x, { out: reused }); }));
      t.jsCausalPieces = bestOf(t.jsCausalPieces, time(causalPieces));
      t.pyCausalPieces = bestOf(t.pyCausalPieces, await askTime(`causal_pieces ${PIECE}`));
      t.jsZeroPieces = bestOf(t.jsZeroPieces, time(zeroPieces));
      t.pyZeroPieces = bestOf(t.pyZeroPieces, await askTime(`zerophase_pieces ${PIECE}`));
      await ask('hugepages off');
      t.pyCausalSmallPages = bestOf(t.pyCausalSmallPages, await askTime('causal'));
      t.pyZeroSmallPages = bestOf(t.pyZeroSmallPages, await askTime('zerophase'));
      await ask('hugepages on');
      t.touch = bestOf(t.touch, time(() => {
        touched = new Float64Array(SAMPLES);
        for (let i = 0; i < SAMPLES; i += 512) touched[i] = 1;
      }));
    }
    writeFileSync(join(dir, 'causal.f64'), bytes(causal));
    writeFileSync(join(dir, 'zero.f64'), bytes(zero));
    const agreement = JSON.parse(await ask(`compare ${join(dir, 'causal.f64')} ${join(dir, 'zero.f64')}`)) as { causal: number; zerophase: number };
    // The piecewise results, computed again untimed and joined, against scipy's piecewise results.
    const state = new Float64Array(sos.length / 3);
    for (let a = 0; a < SAMPLES; a += PIECE) {
      causal.set(sosfilt(sos, x.subarray(a, a + PIECE), { state }), a);
      zero.set(sosfiltfilt(sos, x.subarray(a, a + PIECE)), a);
    }
    writeFileSync(join(dir, 'causal.f64'), bytes(causal));
    writeFileSync(join(dir, 'zero.f64'), bytes(zero));
    const pieceAgreement = JSON.parse(await ask(`compare_pieces ${PIECE} ${join(dir, 'causal.f64')} ${join(dir, 'zero.f64')}`)) as { causal: number; zerophase: number };
    py.stdin.write('quit\n');

    const ms = (s: number) => `${(SAMPLES / s / 1e6).toFixed(1).padStart(6)} M samples/s`;
    const row = (name: string, v: Timing) => console.log(`  ${name.padEnd(40)} cpu ${ms(v.cpu)}   wall ${ms(v.wall)}`);
    const ratio = (js: Timing, py: Timing) => `cpu ${(py.cpu / js.cpu).toFixed(2)}x, wall ${(py.wall / js.wall).toFixed(2)}x`;
    console.log(`data: ${SAMPLES.toLocaleString('en')} float64 samples (one channel-day at ${RATE} Hz); Butterworth band-pass order 4, 1-20 Hz, ${sos.length / 6} sections; best of ${ROUNDS} alternating rounds`);
    console.log(`reference: scipy ${versions.scipy}, numpy ${versions.numpy} (python3), same samples and sections`);
    const report = (title: string, name: string, fresh: Timing, reusedOut: Timing, scipy: Timing, scipySmallPages: Timing, jsPieces: Timing, pyPieces: Timing, agree: number, agreePieces: number) => {
      console.log(title);
      row(`Daybreak ${name}, whole day, new output`, fresh);
      row(`Daybreak ${name}, whole day, reused output`, reusedOut);
      row(`scipy ${name}, whole day`, scipy);
      row(`scipy ${name}, whole day, 4 KiB pages`, scipySmallPages);
      row(`Daybreak ${name}, ${PIECE}-sample pieces`, jsPieces);
      row(`scipy ${name}, ${PIECE}-sample pieces`, pyPieces);
      console.log(`  ratio Daybreak/scipy, whole day: new output ${ratio(fresh, scipy)}; reused output ${ratio(reusedOut, scipy)} (target >= 1.0x)`);
      console.log(`  ratio Daybreak/scipy, whole day, new output on both sides in 4 KiB pages (numpy's huge pages off): ${ratio(fresh, scipySmallPages)} (target >= 1.0x)`);
      console.log(`  ratio Daybreak/scipy, pieces (new output each): ${ratio(jsPieces, pyPieces)} (target >= 1.0x)`);
      console.log(`  outputs agree to ${agree.toExponential(1)} of the peak (whole day), ${agreePieces.toExponential(1)} (pieces)`);
    };
    report('causal', 'sosfilt', t.jsCausal, t.jsCausalReused, t.pyCausal, t.pyCausalSmallPages, t.jsCausalPieces, t.pyCausalPieces, agreement.causal, pieceAgreement.causal);
    // Filtering alone on both sides, no output allocated: scipy's own loop (the private function its
    // sosfilt calls after copying the input) against Daybreak's into a reused output.
    row('scipy sosfilt\'s own loop, in place', t.pyCausalInPlace);
    console.log(`  ratio Daybreak/scipy, filtering alone (reused output against scipy's loop in place, no allocation either side): ${ratio(t.jsCausalReused, t.pyCausalInPlace)}`);
    report('zero-phase', 'sosfiltfilt', t.jsZero, t.jsZeroReused, t.pyZero, t.pyZeroSmallPages, t.jsZeroPieces, t.pyZeroPieces, agreement.zerophase, pieceAgreement.zerophase);
    console.log(`first touch of a new ${SAMPLES.toLocaleString('en')}-sample Float64Array (page faults alone, no filtering): cpu ${(t.touch.cpu * 1000).toFixed(1)} ms, wall ${(t.touch.wall * 1000).toFixed(1)} ms`);
    touched = new Float64Array(0);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

await main();

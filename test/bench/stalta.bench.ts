/**
 * STA/LTA benchmark: the recursive STA/LTA of core/pick/staLta.ts against the same recursion as a
 * plain C loop (test/ref/c/stalta.c, built here with gcc -O2) in the same run on the same samples.
 *
 * Data: one channel-day at 100 Hz, 8,640,000 float64 samples of seeded noise (AR(1)-coloured Gaussian)
 * with decaying bursts, written to test/.build/ for the C program. Settings: the defaults (CF x^2,
 * median of three, STA 0.5 s, LTA 60 s, 1 s warm-up), and the same without the median of three; the
 * C loop mirrors each. Both outputs' sums are compared, so the two computed the same ratio.
 *
 * Printed, per setting: samples/s of each (best of several passes), and their ratio (target >= 0.6).
 *
 *   npm run bench -- stalta
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { StaLtaRatio } from '../../core/pick/staLta';

const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, '..', '..');
const N = 8_640_000;
const RATE = 100;
const ROUNDS = 5; // alternating rounds; each runs PASSES passes
const PASSES = 4;

declare const gc: () => void;

/** Seeded mulberry32 generator in [0, 1). */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function channelDay(): Float64Array {
  const rnd = mulberry32(20261202);
  const x = new Float64Array(N);
  let ar = 0;
  let burst = 0;
  for (let i = 0; i < N; i++) {
    const g = Math.sqrt(-2 * Math.log(1 - rnd())) * Math.cos(2 * Math.PI * rnd());
    ar = 0.8 * ar + g;
    if (rnd() < 1 / (RATE * 900)) burst = 50 * Math.pow(10, 2 * rnd());
    burst *= 0.995;
    x[i] = ar + burst * Math.sin(0.9 * i);
  }
  return x;
}

function main(): void {
  const load0 = loadavg()[0];
  const x = channelDay();
  const buildDir = join(root, 'test', '.build');
  mkdirSync(buildDir, { recursive: true });
  const binary = join(buildDir, 'stalta');
  execFileSync('gcc', ['-O2', '-Wall', '-Werror', '-o', binary, join(root, 'test', 'ref', 'c', 'stalta.c')], { stdio: 'inherit' });
  const input = join(buildDir, 'stalta-input.f64');
  writeFileSync(input, new Uint8Array(x.buffer));

  console.log(`recursive STA/LTA, ${N.toLocaleString('en-US')} samples (one day at ${RATE} Hz), CF x^2, STA 0.5 s / LTA 60 s`);
  let allSame = true;
  for (const despike of [true, false]) {
    const r = new StaLtaRatio(RATE, { despike });
    const out = new Float64Array(N);
    let jsBest = Infinity;
    let cBest = Infinity;
    let cSum = NaN;
    for (let round = 0; round < ROUNDS; round++) {
      const c = JSON.parse(execFileSync(binary, [input, String(r.ns), String(r.nl), String(r.seed), String(PASSES), despike ? '1' : '0']).toString());
      cBest = Math.min(cBest, c.best);
      cSum = c.sum;
      gc();
      for (let p = 0; p < PASSES; p++) {
        r.restart();
        const t0 = performance.now();
        r.process(x, 0, N, out, 0);
        jsBest = Math.min(jsBest, (performance.now() - t0) / 1000);
      }
    }
    let jsSum = 0;
    for (let i = 0; i < N; i++) jsSum += out[i];
    const same = Math.abs(jsSum - cSum) <= 1e-9 * Math.abs(cSum);
    allSame &&= same;
    const jsRate = N / jsBest;
    const cRate = N / cBest;
    const ratio = jsRate / cRate;
    console.log(despike ? 'default setting (median of three on the CF):' : 'plain recursion (no median of three):');
    console.log(`  plain C loop (gcc -O2):    ${(cRate / 1e6).toFixed(0)} M samples/s (${(cBest * 1000).toFixed(1)} ms)`);
    console.log(`  Daybreak StaLtaRatio (JS): ${(jsRate / 1e6).toFixed(0)} M samples/s (${(jsBest * 1000).toFixed(1)} ms)`);
    console.log(`  same ratio values: ${same ? 'yes' : 'NO'} (sum ${jsSum.toPrecision(15)} vs C ${Number(cSum).toPrecision(15)})`);
    console.log(`  ratio: ${ratio.toFixed(2)} of C (target >= 0.6) ${ratio >= 0.6 ? 'met' : 'NOT MET'}`);
  }
  rmSync(input, { force: true });
  console.log(`load average (1 min) at start ${load0.toFixed(1)}, now ${loadavg()[0].toFixed(1)} on ${availableParallelism()} cores: figures from a shared machine vary with it`);
  if (!allSame) process.exitCode = 1;
}

main();

/**
 * `daybreak demo [--out DIR] [--seed N] [--workers N]`: (re)generates the invented demo scenario, by default into
 * samples/generated/ of the repository, printing progress on stderr and a summary on stdout.
 * --workers N: worker threads (default 2; 0 does everything in the calling thread).
 */
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeScenario } from '../scenario';

const USAGE = 'usage: daybreak demo [--out DIR] [--seed N] [--workers N]\n';

export async function demo(args: string[]): Promise<number> {
  let out = join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..', 'samples', 'generated');
  let seed: number | undefined;
  let workers: number | undefined;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--out' && i + 1 < args.length) out = resolve(args[++i]);
    else if (a === '--seed' && i + 1 < args.length) {
      seed = Number(args[++i]);
      if (!Number.isInteger(seed)) {
        process.stderr.write(`daybreak demo: --seed must be an integer, got "${args[i]}"\n${USAGE}`);
        return 2;
      }
    } else if (a === '--workers' && i + 1 < args.length) {
      workers = Number(args[++i]);
      if (!Number.isInteger(workers) || workers < 0 || workers > 64) {
        process.stderr.write(`daybreak demo: --workers must be an integer from 0 to 64, got "${args[i]}"\n${USAGE}`);
        return 2;
      }
    } else if (a === '--help' || a === '-h') {
      process.stdout.write(USAGE);
      return 0;
    } else {
      process.stderr.write(`daybreak demo: unknown argument "${a}"\n${USAGE}`);
      return 2;
    }
  }
  let last = -1;
  const r = await writeScenario(out, {
    seed,
    workers,
    onProgress: (f, msg) => {
      const pct = Math.floor(f * 100);
      if (pct !== last) {
        last = pct;
        process.stderr.write(`\r${String(pct).padStart(3)}% ${msg.padEnd(20)}`);
      }
    },
  });
  process.stderr.write('\n');
  process.stdout.write(`demo scenario written to ${out}: ${r.files} files, ${(r.waveformBytes / 1e6).toFixed(1)} MB of miniSEED, ${r.seconds.toFixed(1)} s, ${r.workers ? `${r.workers} worker threads` : "in one thread"}\n`);
  return 0;
}

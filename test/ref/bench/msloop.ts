/** Builds (when missing or older than its source) the libmseed record-loop decoder the benches time against. */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

export function buildMsloop(root: string): string {
  const buildDir = join(root, 'test', '.build');
  mkdirSync(buildDir, { recursive: true });
  const source = join(root, 'test', 'ref', 'bench', 'msloop.c');
  const binary = join(buildDir, 'msloop');
  if (!existsSync(binary) || statSync(binary).mtimeMs < statSync(source).mtimeMs) {
    execFileSync('gcc', ['-O2', '-Wall', '-Werror', '-o', binary, source, '-lmseed'], { stdio: 'inherit' });
  }
  return binary;
}

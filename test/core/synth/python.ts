/**
 * Runs a short Python script (numpy / scipy in the machine's python3) with JSON on stdin and returns
 * its JSON answer: the outside reference for the synthetic-seismogram tests.
 */
import { execFileSync } from 'node:child_process';

export function python<T>(script: string, input: unknown): T {
  const json = JSON.stringify(input, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v));
  const imports = script.includes("scipy") ? "import scipy, scipy.signal\n" : "";
  const full = `import sys, json\nimport numpy as np\n${imports}inp = json.loads(sys.stdin.read())\n${script}\n`;
  return JSON.parse(execFileSync('python3', ['-c', full], { input: json, maxBuffer: 1 << 30 }).toString()) as T;
}

/** Versions of the reference libraries, for the test names' notes. */
export function referenceVersions(): string {
  return python<string>('print(json.dumps(f"numpy {np.__version__}, scipy {scipy.__version__}"))', null);
}

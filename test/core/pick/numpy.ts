// Runs a short Python script with numpy/scipy (the outside reference for the picking tests) and moves
// float64 arrays both ways as raw little-endian bytes. The script sees `inputs` (a list of numpy
// arrays) and must assign `outputs` (a list of 1-D arrays).
import { execFileSync } from 'node:child_process';

const PRELUDE = `
import sys, json, numpy as np
_raw = sys.stdin.buffer.read()
_nl = _raw.index(b'\\n')
_lens = json.loads(_raw[:_nl])
_off = _nl + 1
inputs = []
for _n in _lens:
    inputs.append(np.frombuffer(_raw[_off:_off + 8 * _n], dtype='<f8').copy())
    _off += 8 * _n
`;
const POSTLUDE = `
_outs = [np.ascontiguousarray(np.asarray(o, dtype='<f8').ravel()) for o in outputs]
sys.stdout.buffer.write((json.dumps([len(o) for o in _outs]) + '\\n').encode())
for o in _outs:
    sys.stdout.buffer.write(o.tobytes())
`;

export function numpy(script: string, inputs: readonly Float64Array[] = []): Float64Array[] {
  const head = Buffer.from(JSON.stringify(inputs.map((a) => a.length)) + '\n');
  const body = inputs.map((a) => Buffer.from(a.buffer, a.byteOffset, a.byteLength));
  const out = execFileSync('python3', ['-c', PRELUDE + script + POSTLUDE], {
    input: Buffer.concat([head, ...body]), maxBuffer: 1 << 30,
  });
  const nl = out.indexOf(10);
  const lens = JSON.parse(out.subarray(0, nl).toString()) as number[];
  let off = nl + 1;
  return lens.map((n) => {
    const a = new Float64Array(n);
    Buffer.from(a.buffer).set(out.subarray(off, off + 8 * n));
    off += 8 * n;
    return a;
  });
}

/** numpy and scipy versions, for the test names' source notes. */
export function numpyVersions(): string {
  const [v] = numpy(`import scipy\nprint_ = None\noutputs = [np.array([float(x) for x in (np.__version__ + '.' + scipy.__version__).split('.')[:6]])]`);
  return `numpy ${v[0]}.${v[1]}.${v[2]}, scipy ${v[3]}.${v[4]}.${v[5]}`;
}

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { request } from 'node:http';
import { mkdtempSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { HostService, DEMO_COMPLETE_MARKER } from '../../../electron/host/service';
import { startBrowserServer, TOKEN_HEADER, type BrowserServer } from '../../../electron/host/server';
import { splitRanges } from '../../../electron/contract';

const EVENT_XML = '<?xml version="1.0"?><q:quakeml xmlns:q="x"/>';

interface Reply { status: number; type: string; body: Buffer; headers: Record<string, string | string[] | undefined> }

function send(port: number, opts: { method?: string; path: string; headers?: Record<string, string>; body?: string }): Promise<Reply> {
  return new Promise((ok, fail) => {
    const req = request({ host: '127.0.0.1', port, method: opts.method ?? 'GET', path: opts.path, headers: opts.headers }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => ok({ status: res.statusCode ?? 0, type: String(res.headers['content-type'] ?? ''), body: Buffer.concat(chunks), headers: res.headers }));
    });
    req.on('error', fail);
    if (opts.body !== undefined) req.write(opts.body);
    req.end();
  });
}

describe('browser-mode server', () => {
  let server: BrowserServer;
  let dataRoot: string;
  let userDir: string;
  const api = (name: string, body: unknown, extra: Record<string, string> = {}) => send(server.port, {
    method: 'POST', path: `/api/${name}`, body: JSON.stringify(body),
    headers: { host: `127.0.0.1:${server.port}`, 'content-type': 'application/json', [TOKEN_HEADER]: server.token, ...extra },
  });

  beforeAll(async () => {
    const base = mkdtempSync(join(tmpdir(), 'daybreak-server-'));
    const staticDir = join(base, 'static');
    mkdirSync(staticDir);
    writeFileSync(join(staticDir, 'index.html'), '<!doctype html><title>t</title>');
    dataRoot = join(base, 'data');
    mkdirSync(join(dataRoot, 'day1'), { recursive: true });
    writeFileSync(join(dataRoot, 'day1', 'XX.AB..HHZ.mseed'), Buffer.from([1, 2, 3, 250]));
    writeFileSync(join(dataRoot, 'stations.xml'), '<FDSNStationXML/>');
    writeFileSync(join(dataRoot, 'day1', 'event.xml'), EVENT_XML);
    writeFileSync(join(base, 'secret.txt'), 'not yours');
    const demoRoot = join(base, 'demo');
    userDir = join(base, 'user');
    mkdirSync(demoRoot);
    writeFileSync(join(demoRoot, DEMO_COMPLETE_MARKER), '{}');
    server = await startBrowserServer({ service: new HostService({ mode: 'browser', version: '9.9.9', demoRoot, userDir }), staticDir });
  });
  afterAll(async () => { await server.close(); });

  it('listens on 127.0.0.1 and puts the token in the URL fragment, not the path', () => {
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/#token=${server.token}`);
    expect(server.token).toMatch(/^[0-9a-f]{64}$/);
  });

  it('serves the renderer with a Content-Security-Policy that allows only its own origin', async () => {
    const r = await send(server.port, { path: '/', headers: { host: `127.0.0.1:${server.port}` } });
    expect(r.status).toBe(200);
    expect(r.type).toContain('text/html');
    expect(r.headers['content-security-policy']).toContain("default-src 'self'");
    expect(r.headers['content-security-policy']).toContain("script-src 'self'");
  });

  it('refuses a request whose Host header names another server (DNS rebinding)', async () => {
    const r = await send(server.port, { path: '/', headers: { host: `evil.example:${server.port}` } });
    expect(r.status).toBe(421);
  });

  it('refuses API calls without the token, with a wrong token, or from a foreign origin', async () => {
    expect((await api('app.info', {}, { [TOKEN_HEADER]: '' })).status).toBe(403);
    expect((await api('app.info', {}, { [TOKEN_HEADER]: 'f'.repeat(64) })).status).toBe(403);
    expect((await api('app.info', {}, { origin: 'http://evil.example' })).status).toBe(403);
  });

  it('refuses API calls that are not JSON POSTs', async () => {
    const get = await send(server.port, { path: '/api/app.info', headers: { host: `127.0.0.1:${server.port}`, [TOKEN_HEADER]: server.token } });
    expect(get.status).toBe(405);
    expect((await api('app.info', {}, { 'content-type': 'text/plain' })).status).toBe(415);
  });

  it('answers app.info with the mode and version', async () => {
    const r = await api('app.info', {});
    expect(JSON.parse(r.body.toString())).toEqual({ ok: true, value: { mode: 'browser', version: '9.9.9' } });
  });

  it('lists a dataset recursively, telling StationXML from QuakeML by the root element', async () => {
    const r = JSON.parse((await api('dataset.open', { root: dataRoot })).body.toString());
    expect(r.ok).toBe(true);
    expect(r.value.files).toEqual([
      { path: 'day1/XX.AB..HHZ.mseed', size: 4, kind: 'miniseed' },
      { path: 'day1/event.xml', size: Buffer.byteLength(EVENT_XML), kind: 'quakeml' },
      { path: 'stations.xml', size: 17, kind: 'stationxml' },
    ]);
  });

  it('returns file bytes as octet-stream, only inside an opened dataset', async () => {
    await api('dataset.open', { root: dataRoot });
    const r = await api('file.read', { root: dataRoot, path: 'day1/XX.AB..HHZ.mseed' });
    expect(r.type).toBe('application/octet-stream');
    expect([...r.body]).toEqual([1, 2, 3, 250]);
    const escape = JSON.parse((await api('file.read', { root: dataRoot, path: '../secret.txt' })).body.toString());
    expect(escape).toMatchObject({ ok: false, code: 'forbidden' });
    const unopened = JSON.parse((await api('file.read', { root: join(dataRoot, '..'), path: 'secret.txt' })).body.toString());
    expect(unopened).toMatchObject({ ok: false, code: 'forbidden' });
  });

  it('returns a byte range of a file, shorter at its end', async () => {
    await api('dataset.open', { root: dataRoot });
    const mid = await api('file.readRange', { root: dataRoot, path: 'day1/XX.AB..HHZ.mseed', offset: 1, length: 2 });
    expect([...mid.body]).toEqual([2, 3]);
    const tail = await api('file.readRange', { root: dataRoot, path: 'day1/XX.AB..HHZ.mseed', offset: 2, length: 100 });
    expect([...tail.body]).toEqual([3, 250]);
    const bad = JSON.parse((await api('file.readRange', { root: dataRoot, path: 'day1/XX.AB..HHZ.mseed', offset: -1, length: 2 })).body.toString());
    expect(bad).toMatchObject({ ok: false, code: 'bad-request' });
  });

  it('returns several ranges in one framed answer that splitRanges takes apart', async () => {
    await api('dataset.open', { root: dataRoot });
    const r = await api('file.readRanges', { root: dataRoot, ranges: [
      { path: 'day1/XX.AB..HHZ.mseed', offset: 0, length: 2 },
      { path: 'stations.xml', offset: 1, length: 5 },
      { path: 'day1/XX.AB..HHZ.mseed', offset: 3, length: 10 },
    ] });
    expect(r.type).toBe('application/octet-stream');
    const parts = splitRanges(new Uint8Array(r.body));
    expect(parts.map((p) => [...p])).toEqual([[1, 2], [...Buffer.from('FDSNS')], [250]]);
  });

  it('answers bad arguments and unknown requests with a value, not a crash', async () => {
    expect(JSON.parse((await api('file.read', { root: 42 })).body.toString())).toMatchObject({ ok: false, code: 'bad-request' });
    expect(JSON.parse((await api('no.such', {})).body.toString())).toMatchObject({ ok: false, code: 'bad-request' });
    expect(JSON.parse((await api('dataset.open', { root: join(dataRoot, 'missing') })).body.toString())).toMatchObject({ ok: false, code: 'not-found' });
    const broken = await send(server.port, { method: 'POST', path: '/api/app.info', body: '{nope', headers: { host: `127.0.0.1:${server.port}`, 'content-type': 'application/json', [TOKEN_HEADER]: server.token } });
    expect(JSON.parse(broken.body.toString())).toMatchObject({ ok: false, code: 'bad-request' });
  });

  it('writes exports atomically beside the review file, with safe names only', async () => {
    await api('dataset.open', { root: dataRoot });
    const r = JSON.parse((await api('export.write', { root: dataRoot, name: 'night.xml', content: '<q/>' })).body.toString());
    expect(r).toEqual({ ok: true, value: { path: join(dataRoot, 'daybreak-exports', 'night.xml') } });
    expect(readFileSync(r.value.path, 'utf8')).toBe('<q/>');
    const bad = JSON.parse((await api('export.write', { root: dataRoot, name: '../x.xml', content: '' })).body.toString());
    expect(bad).toMatchObject({ ok: false, code: 'bad-request' });
  });

  it('takes a large export or review in one request (6 MB: a night of hundreds of events at 60 sites)', async () => {
    await api('dataset.open', { root: dataRoot });
    const content = `<q>${'x'.repeat(6_000_000)}</q>`;
    const r = JSON.parse((await api('export.write', { root: dataRoot, name: 'big.xml', content })).body.toString());
    expect(r).toMatchObject({ ok: true });
    expect(readFileSync(r.value.path, 'utf8').length).toBe(content.length);
  });

  it('keeps settings in the user folder and refuses a bad authority or scan preset', async () => {
    expect(JSON.parse((await api('settings.get', {})).body.toString()).value).toEqual({ analyst: '', agency: '', authority: 'daybreak.local', scanPreset: 'auto' });
    const set = JSON.parse((await api('settings.set', { analyst: 'J. Doe', agency: 'XX' })).body.toString());
    expect(set.value).toEqual({ analyst: 'J. Doe', agency: 'XX', authority: 'daybreak.local', scanPreset: 'auto' });
    expect(JSON.parse((await api('settings.get', {})).body.toString()).value.analyst).toBe('J. Doe');
    expect(JSON.parse((await api('settings.set', { authority: 'no spaces' })).body.toString())).toMatchObject({ ok: false, code: 'bad-request' });
    expect(JSON.parse((await api('settings.set', { scanPreset: 'near' })).body.toString()).value.scanPreset).toBe('near');
    expect(JSON.parse((await api('settings.set', { scanPreset: 'fast' })).body.toString())).toMatchObject({ ok: false, code: 'bad-request', message: expect.stringMatching(/scanPreset must be one of auto, local, near, got "fast"/) });
    expect(JSON.parse((await api('settings.set', { scanPreset: 'auto' })).body.toString()).value.scanPreset).toBe('auto');
  });

  it('keeps the other settings when the settings file holds a scan preset it does not know (another version, or edited by hand)', async () => {
    mkdirSync(userDir, { recursive: true });
    writeFileSync(join(userDir, 'settings.json'), JSON.stringify({ analyst: 'J. Doe', agency: 'XX', authority: 'obs.example', scanPreset: 'regional' }));
    expect(JSON.parse((await api('settings.get', {})).body.toString()).value).toEqual({ analyst: 'J. Doe', agency: 'XX', authority: 'obs.example', scanPreset: 'auto' });
    expect(JSON.parse((await api('settings.set', { scanPreset: 'near' })).body.toString()).value).toEqual({ analyst: 'J. Doe', agency: 'XX', authority: 'obs.example', scanPreset: 'near' });
  });

  it('refuses to cancel the scan of a folder that was not opened', async () => {
    expect(JSON.parse((await api('scan.cancel', { root: '/not/opened' })).body.toString())).toMatchObject({ ok: false, code: 'forbidden' });
  });

  it('reports a finished demo scenario as ready', async () => {
    const r = JSON.parse((await api('demo.status', {})).body.toString());
    expect(r.value.state).toBe('ready');
  });
});

import { describe, expect, it } from 'vitest';
import { build } from 'esbuild';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createRequire } from 'node:module';
import { HOST_REQUEST_NAMES } from '../../electron/contract';

// The Electron runtime cannot be downloaded here, so the desktop shell is loaded with a recording
// stand-in for the `electron` module: this checks what main.ts asks Electron to do (Electron's
// security checklist, docs/tutorial/security.md), not Electron itself.
const repo = resolve(__dirname, '..', '..');

async function loadMainWithFakeElectron() {
  const dir = mkdtempSync(join(tmpdir(), 'daybreak-main-'));
  const out = join(dir, 'main.cjs');
  await build({ entryPoints: [join(repo, 'electron/main.ts')], bundle: true, platform: 'node', format: 'cjs', outfile: out, external: ['electron'], logLevel: 'silent' });
  const rec = {
    handlers: new Map<string, (event: unknown, req: unknown) => unknown>(),
    windows: [] as { opts: Record<string, unknown>; url?: string }[],
    privileged: [] as unknown[],
    contentsHandlers: new Map<string, (...a: unknown[]) => void>(),
    windowOpenHandler: null as null | (() => unknown),
    permissionHandler: null as null | ((wc: unknown, perm: string, done: (ok: boolean) => void) => void),
  };
  const fakeElectron = {
    app: {
      whenReady: () => Promise.resolve(), getVersion: () => '0.0.0-test', getAppPath: () => dir, getPath: () => dir,
      on: (name: string, fn: (...a: unknown[]) => void) => {
        if (name === 'web-contents-created') {
          fn({}, { on: (ev: string, h: (...a: unknown[]) => void) => rec.contentsHandlers.set(ev, h), setWindowOpenHandler: (h: () => unknown) => { rec.windowOpenHandler = h; } });
        }
      },
      quit: () => undefined, exit: () => undefined,
    },
    protocol: { registerSchemesAsPrivileged: (x: unknown) => rec.privileged.push(x), handle: () => undefined },
    net: { fetch: () => Promise.resolve(new Response('')) },
    ipcMain: { handle: (ch: string, fn: (event: unknown, req: unknown) => unknown) => rec.handlers.set(ch, fn) },
    BrowserWindow: class {
      webContents = { session: { setPermissionRequestHandler: (h: typeof rec.permissionHandler) => { rec.permissionHandler = h; } } };
      constructor(opts: Record<string, unknown>) { rec.windows.push({ opts }); }
      loadURL(url: string) { rec.windows[rec.windows.length - 1].url = url; return Promise.resolve(); }
    },
  };
  const stub = join(dir, 'node_modules', 'electron');
  (await import('node:fs')).mkdirSync(stub, { recursive: true });
  writeFileSync(join(stub, 'index.js'), 'module.exports = globalThis.__fakeElectron;');
  (globalThis as Record<string, unknown>).__fakeElectron = fakeElectron;
  createRequire(out)(out);
  await new Promise((r) => setTimeout(r, 50));
  return rec;
}

describe('desktop shell (electron/main.ts) with a stand-in Electron', () => {
  it('opens one window with context isolation and sandbox on and Node integration off, on the app:// scheme', async () => {
    const rec = await loadMainWithFakeElectron();
    expect(rec.windows).toHaveLength(1);
    const web = rec.windows[0].opts.webPreferences as Record<string, unknown>;
    expect(web).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false, webSecurity: true });
    expect(rec.windows[0].url).toBe('app://daybreak/index.html');
    expect(JSON.stringify(rec.privileged)).toContain('"scheme":"app"');
  });

  it('answers exactly the contract\'s requests over IPC, and refuses senders that are not the app\'s top frame', async () => {
    const rec = await loadMainWithFakeElectron();
    expect([...rec.handlers.keys()].sort()).toEqual(HOST_REQUEST_NAMES.map((n) => `daybreak:${n}`).sort());
    const info = rec.handlers.get('daybreak:app.info')!;
    const mainFrame = { url: 'app://daybreak/index.html' };
    expect(await info({ senderFrame: mainFrame, sender: { mainFrame } }, {})).toEqual({ ok: true, value: { mode: 'desktop', version: '0.0.0-test' } });
    const evil = { url: 'https://evil.example/' };
    expect(await info({ senderFrame: evil, sender: { mainFrame: evil } }, {})).toMatchObject({ ok: false, code: 'forbidden' });
    const sub = { url: 'app://daybreak/index.html' };
    expect(await info({ senderFrame: sub, sender: { mainFrame } }, {})).toMatchObject({ ok: false, code: 'forbidden' });
  });

  it('refuses navigation, new windows, webviews and permission requests', async () => {
    const rec = await loadMainWithFakeElectron();
    let prevented = 0;
    rec.contentsHandlers.get('will-navigate')!({ preventDefault: () => prevented++ });
    rec.contentsHandlers.get('will-attach-webview')!({ preventDefault: () => prevented++ });
    expect(prevented).toBe(2);
    expect(rec.windowOpenHandler!()).toEqual({ action: 'deny' });
    let granted: boolean | null = null;
    rec.permissionHandler!({}, 'media', (ok) => { granted = ok; });
    expect(granted).toBe(false);
  });
});

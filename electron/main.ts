/**
 * The desktop shell (Electron main process). Thin on purpose: it opens one window on the built
 * renderer, served from a private `app://` scheme, and forwards the renderer's requests to the same
 * HostService the browser mode uses (everything it calls is tested through the browser mode).
 * Security, per Electron's checklist: context isolation and sandbox on, no Node in the renderer, a
 * Content-Security-Policy on every page, navigation and new windows refused, every IPC sender checked.
 */
import { app, BrowserWindow, ipcMain, net, protocol, type IpcMainInvokeEvent } from 'electron';
import { join, normalize, sep } from 'node:path';
import { pathToFileURL } from 'node:url';
import { HOST_REQUEST_NAMES, type HostRequestName } from './contract';
import { HostService } from './host/service';
import { generateDemoScenario } from './host/demo';
import { CONTENT_SECURITY_POLICY } from './host/server';

const SCHEME = 'app';
const ORIGIN = `${SCHEME}://daybreak`;
const rendererDir = join(__dirname, '..', 'renderer');

protocol.registerSchemesAsPrivileged([
  { scheme: SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true } },
]);

function isTrustedSender(event: IpcMainInvokeEvent): boolean {
  const frame = event.senderFrame;
  if (!frame || frame !== event.sender.mainFrame) return false;   // top-level frame only
  try {
    // Compare scheme and host (URL.origin of a custom scheme is "null" outside Chromium).
    const url = new URL(frame.url);
    return url.protocol === `${SCHEME}:` && url.host === 'daybreak';
  } catch {
    return false;
  }
}

async function start(): Promise<void> {
  await app.whenReady();
  protocol.handle(SCHEME, async (request) => {
    const url = new URL(request.url);
    const rel = url.pathname === '/' ? 'index.html' : decodeURIComponent(url.pathname).replace(/^\/+/, '');
    const full = normalize(join(rendererDir, rel));
    if (url.host !== 'daybreak' || !full.startsWith(rendererDir + sep)) return new Response('forbidden', { status: 403 });
    const res = await net.fetch(pathToFileURL(full).toString());
    const headers = new Headers(res.headers);
    headers.set('content-security-policy', CONTENT_SECURITY_POLICY);
    return new Response(res.body, { status: res.status, headers });
  });

  const service = new HostService({
    mode: 'desktop',
    version: app.getVersion(),
    demoRoot: process.env.DAYBREAK_DEMO_DIR ?? join(app.getAppPath(), 'samples', 'generated'),
    userDir: app.getPath('userData'),
    generateDemo: generateDemoScenario,
  });
  app.on('will-quit', () => {
    service.scans.stopAll();
    void service.locks.releaseAll();
  });
  for (const name of HOST_REQUEST_NAMES) {
    ipcMain.handle(`daybreak:${name}`, (event, request: unknown) => {
      if (!isTrustedSender(event)) return { ok: false, code: 'forbidden', message: 'untrusted sender' };
      return service.handle(name as HostRequestName, request);
    });
  }

  app.on('web-contents-created', (_e, contents) => {
    contents.on('will-navigate', (e) => e.preventDefault());
    contents.on('will-attach-webview', (e) => e.preventDefault());
    contents.setWindowOpenHandler(() => ({ action: 'deny' }));
  });

  const win = new BrowserWindow({
    width: 1440,
    height: 900,
    title: 'Daybreak',
    backgroundColor: '#1b1d22',
    webPreferences: {
      preload: join(__dirname, 'preload.cjs'),
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      webSecurity: true,
    },
  });
  win.webContents.session.setPermissionRequestHandler((_wc, _perm, done) => done(false));
  await win.loadURL(`${ORIGIN}/index.html`);
}

app.on('window-all-closed', () => app.quit());
start().catch((e: unknown) => {
  console.error(e);
  app.exit(1);
});

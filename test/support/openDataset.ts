/**
 * End-to-end helper: the app in browser mode opened straight on a dataset folder, with the demo marked
 * as written (so none is generated) and the background scan off, once its first trace row is drawn.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openApp, type RunningApp } from './browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';

/** Opens `data` in a `width` x `height` page; page errors and console errors are pushed to `errors`. */
export async function openDataset(data: string, size: { width: number; height: number }, errors: string[]): Promise<RunningApp> {
  const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
  writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
  const app = await openApp({ demoDir, ...size });
  app.page.on('pageerror', (e) => errors.push(e.message));
  app.page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  await app.page.goto(app.server.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(data)}#`));
  await app.page.locator('.trace-row').first().waitFor({ timeout: 60_000 });
  return app;
}

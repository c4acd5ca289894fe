/**
 * Preload (sandboxed, context-isolated): exposes one method, `daybreakHost.call(name, request)`,
 * for the request names of the contract and nothing else.
 */
import { contextBridge, ipcRenderer } from 'electron';
import { HOST_REQUEST_NAMES } from './contract';

const allowed = new Set<string>(HOST_REQUEST_NAMES);

contextBridge.exposeInMainWorld('daybreakHost', {
  call(name: unknown, request: unknown): Promise<unknown> {
    if (typeof name !== 'string' || !allowed.has(name)) {
      return Promise.resolve({ ok: false, code: 'bad-request', message: `unknown request "${String(name)}"` });
    }
    return ipcRenderer.invoke(`daybreak:${name}`, request);
  },
});

/**
 * The renderer's handle on the host: Electron's preload bridge when present, else HTTP to the
 * browser-mode server with the per-run token. Both satisfy the same contract.
 */
import type { HostApi, HostRequestName, HostResult, RequestOf, ResponseOf } from '../electron/contract';

declare global {
  interface Window {
    daybreakHost?: { call(name: string, request: unknown): Promise<unknown> };
  }
}

const TOKEN_KEY = 'daybreak.token';

function browserToken(): string {
  const m = /(?:^|[#&])token=([0-9a-f]+)/.exec(location.hash);
  if (m) {
    sessionStorage.setItem(TOKEN_KEY, m[1]);
    history.replaceState(null, '', location.pathname + location.search);
    return m[1];
  }
  const saved = sessionStorage.getItem(TOKEN_KEY);
  if (!saved) throw new Error('no access token: open the address the browser-mode server printed');
  return saved;
}

function httpHost(): HostApi {
  const token = browserToken();
  return {
    async call<N extends HostRequestName>(name: N, request: RequestOf<N>): Promise<HostResult<ResponseOf<N>>> {
      let res: Response;
      try {
        res = await fetch(`./api/${name}`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'x-daybreak-token': token },
          body: JSON.stringify(request),
        });
      } catch (e) {
        return { ok: false, code: 'io', message: `the host did not answer: ${e instanceof Error ? e.message : e}` };
      }
      if (!res.ok) return { ok: false, code: 'internal', message: `host answered ${res.status}: ${await res.text()}` };
      if ((res.headers.get('content-type') ?? '').startsWith('application/octet-stream')) {
        return { ok: true, value: new Uint8Array(await res.arrayBuffer()) as ResponseOf<N> };
      }
      return (await res.json()) as HostResult<ResponseOf<N>>;
    },
  };
}

function bridgeHost(bridge: NonNullable<Window['daybreakHost']>): HostApi {
  return {
    call: <N extends HostRequestName>(name: N, request: RequestOf<N>) =>
      bridge.call(name, request) as Promise<HostResult<ResponseOf<N>>>,
  };
}

export function connectHost(): HostApi {
  return window.daybreakHost ? bridgeHost(window.daybreakHost) : httpHost();
}

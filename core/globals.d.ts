// The few host facilities that every runtime Daybreak runs on (browsers, Node, Electron) provides
// with the same behaviour. core/ is compiled without the DOM and Node type libraries, so these are
// declared here, narrowly, instead of pulling either library in.

declare class TextDecoder {
  constructor(label?: string, options?: { fatal?: boolean });
  decode(input?: ArrayBufferView | ArrayBuffer): string;
}
declare class TextEncoder {
  encode(input?: string): Uint8Array;
}

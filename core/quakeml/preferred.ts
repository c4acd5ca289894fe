import type { QmlEvent, QmlOrigin } from './types';

/** An event's preferred origin, else its first; undefined when it has none. */
export function preferredOrigin(e: QmlEvent): QmlOrigin | undefined {
  return e.origins.find((o) => o.id === e.preferredOriginId) ?? e.origins[0];
}

/**
 * In-process Transport to a simulated instrument: the same bytes a socket
 * would carry, delivered asynchronously, with `\n` ending each reply.
 */
import type { Transport, TransportEvents } from '../instruments/transport.ts';
import type { DeviceLink } from './device-link.ts';
import type { ScpiDevice } from './scpi-device.ts';

export class NotOpenError extends Error {
  override name = 'NotOpenError';
}

export function createSimTransport(device: ScpiDevice, address = `sim://${device.role}`): Transport {
  let link: DeviceLink | null = null;
  const dataListeners = new Set<TransportEvents['data']>();
  const closeListeners = new Set<TransportEvents['close']>();
  const encoder = new TextEncoder();

  return {
    address,
    get isOpen() {
      return link !== null && link.open;
    },
    async open() {
      if (link?.open) return;
      const next = device.connect();
      next.onData((chunk) => {
        for (const listener of dataListeners) listener(chunk);
      });
      next.onClose((reason) => {
        if (link === next) link = null;
        for (const listener of closeListeners) listener(reason);
      });
      link = next;
    },
    async write(data) {
      if (!link?.open) throw new NotOpenError(`${address}: not open`);
      link.write(typeof data === 'string' ? encoder.encode(data) : data);
    },
    async close() {
      const current = link;
      link = null;
      if (current?.open) {
        current.close();
        for (const listener of closeListeners) listener(null);
      }
    },
    on(event, listener) {
      const set = (event === 'data' ? dataListeners : closeListeners) as Set<typeof listener>;
      set.add(listener);
      return () => {
        set.delete(listener);
      };
    },
  };
}

/**
 * Puts a simulated instrument on one end of any byte stream: a TCP socket,
 * or the device side of a serial pty pair (socat) opened with serialport.
 * The device sees a new connection for each attached stream.
 */
import type { Duplex } from 'node:stream';
import type { ScpiDevice } from './scpi-device.ts';

/** Attaches `device` to `stream`; returns a function that detaches (without ending the stream). */
export function attachDeviceToStream(device: ScpiDevice, stream: Duplex): () => void {
  const link = device.connect();
  const onData = (chunk: Buffer | string): void =>
    link.write(typeof chunk === 'string' ? chunk : new Uint8Array(chunk));
  const onEnd = (): void => link.close();
  // Half-close from the host (e.g. `socat -` at end of input): answer what was asked, then end.
  const onInputEnd = (): void =>
    link.endInput(() => {
      if (!stream.destroyed) stream.end();
    });
  stream.on('data', onData);
  stream.on('end', onInputEnd);
  stream.on('close', onEnd);
  stream.on('error', onEnd);
  const offData = link.onData((bytes) => {
    if (!stream.destroyed && stream.writable) stream.write(bytes);
  });
  // A dropped link (fault) ends the stream, as an instrument closing its socket would.
  const offClose = link.onClose(() => {
    if (!stream.destroyed) stream.destroy();
  });
  return () => {
    stream.off('data', onData);
    stream.off('end', onInputEnd);
    stream.off('close', onEnd);
    stream.off('error', onEnd);
    offData();
    offClose();
    link.close();
  };
}

/**
 * Serves `device` on a serial port path (e.g. one end of `socat -d -d pty,raw,echo=0 pty,raw,echo=0`).
 * Uses the serialport package, which the real serial transport uses too.
 */
export async function serveDeviceOnSerial(
  device: ScpiDevice,
  options: { path: string; baudRate?: number },
): Promise<{ close(): Promise<void> }> {
  const { SerialPort } = await import('serialport');
  const port = new SerialPort({ path: options.path, baudRate: options.baudRate ?? 115200, autoOpen: false });
  await new Promise<void>((resolve, reject) => port.open((error) => (error ? reject(error) : resolve())));
  const detach = attachDeviceToStream(device, port);
  return {
    close: () =>
      new Promise<void>((resolve) => {
        detach();
        if (!port.isOpen) return resolve();
        port.close(() => resolve());
      }),
  };
}

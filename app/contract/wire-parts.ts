/**
 * A binary frame (./wire-binary.ts) travels as consecutive WebSocket
 * messages; this cuts it up (main) and joins it back (page).
 */
import { PREFIX_BYTES, WireFrameError } from './wire-binary.ts';

/**
 * The frame is sent as consecutive binary messages of at most this many
 * bytes: Chromium stalls its main thread for seconds when it frees the
 * buffers of one 30 MB message, and 1 MiB parts arrived slower than
 * 256 KiB ones (measured in headless Chromium on the bench machine).
 */
export const PART_BYTES = 1 << 18;

/** The frame cut into the consecutive binary messages that carry it (views, no copies). */
export function frameParts(frame: Uint8Array, partBytes = PART_BYTES): Uint8Array[] {
  const parts: Uint8Array[] = [];
  for (let at = 0; at < frame.byteLength; at += partBytes)
    parts.push(frame.subarray(at, Math.min(frame.byteLength, at + partBytes)));
  return parts;
}

/**
 * Puts a frame back together from its binary messages: push each one;
 * the whole frame comes back once its last byte has arrived (the first
 * message says how long it is). A frame in one message is used as it is.
 */
export class FrameAssembler {
  private frame: Uint8Array | null = null;
  private filled = 0;

  get inProgress(): boolean {
    return this.frame !== null;
  }

  /** The finished frame, null while parts are still due; throws WireFrameError on a malformed start. */
  push(message: ArrayBuffer): ArrayBuffer | null {
    if (this.frame === null) {
      if (message.byteLength < PREFIX_BYTES)
        throw new WireFrameError('binary message shorter than a frame prefix', 'frame');
      const total = new DataView(message).getUint32(4, true);
      if (total === message.byteLength) return message;
      if (total < message.byteLength)
        throw new WireFrameError(`frame length ${total} is shorter than its first part`, 'frame');
      this.frame = new Uint8Array(total);
      this.filled = 0;
    }
    const frame = this.frame;
    if (this.filled + message.byteLength > frame.byteLength) {
      this.reset();
      throw new WireFrameError('binary parts run past the announced frame length', 'frame');
    }
    frame.set(new Uint8Array(message), this.filled);
    this.filled += message.byteLength;
    if (this.filled < frame.byteLength) return null;
    this.reset();
    return frame.buffer as ArrayBuffer;
  }

  reset(): void {
    this.frame = null;
    this.filled = 0;
  }
}

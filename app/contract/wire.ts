/**
 * Wire format of BenchApi over a WebSocket (browser mode). Electron IPC
 * carries the same method names and parameter arrays.
 *
 *   client → server  { id, method, params }            one call
 *   server → client  { id, ok: true, result }           its answer
 *                    { id, ok: false, error: { message, field? } }
 *                    { event: BenchEvent }              pushed events
 *
 * A reply whose result holds typed arrays (openRun: Float64Array numeric
 * columns, Uint8/16/32 codes of text columns) is sent instead as ONE binary
 * message (./wire-binary.ts), so a million-row run needs no number-by-number
 * JSON on either side:
 *
 *   bytes 0..3        header length H, uint32 little-endian
 *   bytes 4..7        the whole frame's length F, uint32 little-endian
 *   bytes 8..8+H      UTF-8 JSON of { id, ok: true, result }, each typed array
 *                     replaced by { "$typedArray": "f64"|"u8"|"u16"|"u32",
 *                     "byteOffset": o, "byteLength": b }
 *   padding           zero bytes up to D = the next multiple of 8
 *   bytes D+o..D+o+b  that array's values, little-endian; o is a multiple
 *                     of 8 and b a whole number of elements
 *
 * The frame goes as consecutive binary messages of at most 1 MiB (nothing
 * else is sent between them); the page joins them until it has F bytes.
 * (One 30 MB message made Chromium stall for seconds when freeing it.)
 * The page opens the socket with binaryType "arraybuffer" and views each
 * block in place (new Float64Array(frame, D + o, b / 8)). It checks every
 * offset and length against the frame, then the reply schema checks that
 * each column holds `samples.rowCount` values (a Float64Array column's
 * byteLength is rowCount·8). Calls, errors and events stay JSON text; the
 * server refuses binary frames from the page.
 *
 * The access token travels as `?token=…` on the WebSocket URL, exactly as on
 * the page URL that `tunebench serve` prints.
 */
import type { BenchEvent, BenchMethod, DesktopMethod } from './bench-api.ts';

export interface WireCall {
  id: number;
  method: BenchMethod;
  params: unknown[];
}

export interface WireError {
  message: string;
  /** Dotted path of the offending field, when a schema rejected the call. */
  field?: string;
}

export type WireReply = { id: number; ok: true; result: unknown } | { id: number; ok: false; error: WireError };

export interface WireEvent {
  event: BenchEvent;
}

export const BENCH_METHODS: readonly BenchMethod[] = [
  'listSerialPorts',
  'listProfiles',
  'connect',
  'disconnect',
  'getConnection',
  'getBenchStatus',
  'manualControl',
  'startSweep',
  'startDrift',
  'startPushing',
  'pauseRun',
  'resumeRun',
  'stopRun',
  'listRuns',
  'previewRun',
  'openRun',
  'windowRun',
  'analyzeRun',
  'runCsvPart',
  'renameRun',
  'addNote',
  'deleteRun',
  'restoreRun',
  'importCsv',
  'startCampaign',
  'resumeCampaign',
  'stopCampaign',
  'confirmUnitChange',
  'getCampaign',
  'listCampaigns',
  'campaignDatasheet',
] as const;

/** Optional methods the desktop preload adds (see BenchApi); the WebSocket carrier has none. */
export const DESKTOP_METHODS: readonly DesktopMethod[] = ['printDatasheetPdf'] as const;

/**
 * A CSV import larger than one part goes as consecutive BINARY messages of
 * one call (./wire-upload.ts), its text as UTF-8 bytes:
 *
 *   bytes 0..3     header length H, uint32 little-endian
 *   bytes 4..4+H   UTF-8 JSON { id, method: "importCsv", fileName, dutId, part, parts }
 *   the rest       the next slice of the text's UTF-8 bytes
 *
 * for part = 0 … parts−1 in order, every slice but the last exactly
 * IMPORT_PART_BYTES long (a slice may end inside a character; main decodes
 * the joined bytes). Main hands each slice straight to the import's worker
 * thread, refuses at once past MAX_IMPORT_BYTES, and answers once, after the
 * last part, like any call. No large message is parsed on main's thread, so a
 * Stop from any page is served between parts.
 */
export const IMPORT_PART_BYTES = 256 * 1024;

/** Largest CSV an import accepts (a week-long log at one reading per second is about 40 MB). */
export const MAX_IMPORT_BYTES = 64 * 1024 * 1024;

/** The cap as people read it, for error messages. */
export const MAX_IMPORT_TEXT = '64 MiB';

/** Largest single WebSocket message main accepts: an import part, or a long plan as JSON. */
export const MAX_WIRE_MESSAGE_BYTES = 4 * 1024 * 1024;

/**
 * The instrument layer frames replies with Node's Buffer (a global in Node);
 * the page gets the same API from the npm `buffer` package. Imported first
 * by the page entry, before any module that might use it.
 */
import { Buffer } from 'buffer';

const scope = globalThis as { Buffer?: unknown };
scope.Buffer ??= Buffer;

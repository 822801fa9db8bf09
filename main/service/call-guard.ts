/**
 * The one way a call from outside reaches the service: the method name and
 * the parameter array arrive as `unknown` (from Electron IPC or the
 * WebSocket), are checked against the contract's schemas, and only then is
 * the method called. Shared by main/ipc/gate.ts and main/server/ws-api.ts so
 * both carriers refuse exactly the same things with the same messages.
 */
import type { BenchApi, BenchMethod, DesktopMethod } from '../../app/contract/bench-api.ts';
import { isBenchMethod, parseCallParams } from '../../app/contract/bench-api-schemas.ts';
import { sanitiseText } from '../../app/contract/excerpt.ts';
import { checkPayloadBounds } from '../../app/contract/payload-bounds.ts';
import type { WireError } from '../../app/contract/wire.ts';
import { BenchApiError } from './errors.ts';

/** Longest error message that goes back to a caller; instrument replies and file text inside it stay short. */
const MAX_ERROR_CHARS = 400;

export type CallOutcome = { ok: true; result: unknown } | { ok: false; error: WireError };

/** Callable surface of a BenchApi, indexed by method name. */
type MethodTable = Partial<Record<BenchMethod | DesktopMethod, (...args: unknown[]) => Promise<unknown>>>;

/** What a caller is told about an error: its message only (never a stack), cut short and with control characters escaped. */
export function describeError(error: unknown): WireError {
  let text: string;
  try {
    text = error instanceof Error ? error.message || error.name : String(error);
  } catch {
    text = 'unknown error';
  }
  const message = sanitiseText(text, MAX_ERROR_CHARS);
  if (error instanceof BenchApiError && error.field) return { message, field: sanitiseText(error.field, 100) };
  return { message };
}

export type CheckedCall =
  { ok: true; method: BenchMethod | DesktopMethod; args: unknown[] } | { ok: false; error: WireError };

/**
 * Checks one call from outside: a known method, a payload inside the shape
 * bounds, then the method's schemas. Never throws: whatever the input does to
 * the checks comes back as a refusal.
 */
export function checkCall(method: unknown, params: unknown): CheckedCall {
  try {
    if (!isBenchMethod(method)) {
      const shown = typeof method === 'string' ? JSON.stringify(sanitiseText(method, 60)) : typeof method;
      return { ok: false, error: { message: `method: unknown BenchApi method ${shown}`, field: 'method' } };
    }
    const bounds = checkPayloadBounds(params);
    if (!bounds.ok) return { ok: false, error: { message: `${method}: ${bounds.message}`, field: bounds.field } };
    const checked = parseCallParams(method, params);
    if (!checked.ok) {
      const message = sanitiseText(checked.message, MAX_ERROR_CHARS);
      return { ok: false, error: checked.field ? { message, field: sanitiseText(checked.field, 100) } : { message } };
    }
    return { ok: true, method, args: checked.args };
  } catch (error) {
    return {
      ok: false,
      error: { message: `params: could not be checked (${describeError(error).message})`, field: 'params' },
    };
  }
}

/** Calls a method whose arguments have already passed `parseCallParams`. Throws what the method throws. */
export async function invokeValidated(
  api: BenchApi,
  method: BenchMethod | DesktopMethod,
  args: unknown[],
): Promise<unknown> {
  const fn = (api as unknown as MethodTable)[method];
  if (typeof fn !== 'function') throw new BenchApiError(`${method}: not available here`, 'method');
  const result = await fn.apply(api, args);
  return result === undefined ? null : result;
}

/** Checks and runs one call; never rejects. */
export async function callBenchApi(api: BenchApi, method: unknown, params: unknown): Promise<CallOutcome> {
  const checked = checkCall(method, params);
  if (!checked.ok) return checked;
  try {
    return { ok: true, result: await invokeValidated(api, checked.method, checked.args) };
  } catch (error) {
    return { ok: false, error: describeError(error) };
  }
}

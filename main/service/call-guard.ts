/**
 * The one way a call from outside reaches the service: the method name and
 * the parameter array arrive as `unknown` (from Electron IPC or the
 * WebSocket), are checked against the contract's schemas, and only then is
 * the method called. Shared by main/ipc/gate.ts and main/server/ws-api.ts so
 * both carriers refuse exactly the same things with the same messages.
 */
import type { BenchApi, BenchMethod, DesktopMethod } from '../../app/contract/bench-api.ts';
import { isBenchMethod, parseCallParams } from '../../app/contract/bench-api-schemas.ts';
import type { WireError } from '../../app/contract/wire.ts';
import { BenchApiError } from './errors.ts';

export type CallOutcome = { ok: true; result: unknown } | { ok: false; error: WireError };

/** Callable surface of a BenchApi, indexed by method name. */
type MethodTable = Partial<Record<BenchMethod | DesktopMethod, (...args: unknown[]) => Promise<unknown>>>;

export function describeError(error: unknown): WireError {
  if (error instanceof BenchApiError) return error.field ? { message: error.message, field: error.field } : { message: error.message };
  if (error instanceof Error) return { message: error.message || error.name };
  return { message: String(error) };
}

/** Calls a method whose arguments have already passed `parseCallParams`. Throws what the method throws. */
export async function invokeValidated(api: BenchApi, method: BenchMethod | DesktopMethod, args: unknown[]): Promise<unknown> {
  const fn = (api as unknown as MethodTable)[method];
  if (typeof fn !== 'function') throw new BenchApiError(`${method}: not available here`, 'method');
  const result = await fn.apply(api, args);
  return result === undefined ? null : result;
}

export async function callBenchApi(api: BenchApi, method: unknown, params: unknown): Promise<CallOutcome> {
  if (!isBenchMethod(method)) {
    const shown = typeof method === 'string' ? JSON.stringify(method.slice(0, 60)) : typeof method;
    return { ok: false, error: { message: `method: unknown BenchApi method ${shown}`, field: 'method' } };
  }
  const checked = parseCallParams(method, params);
  if (!checked.ok) {
    return { ok: false, error: checked.field ? { message: checked.message, field: checked.field } : { message: checked.message } };
  }
  try {
    return { ok: true, result: await invokeValidated(api, method, checked.args) };
  } catch (error) {
    return { ok: false, error: describeError(error) };
  }
}

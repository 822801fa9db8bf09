/**
 * Parameter parsing and reply formatting for the simulated instruments:
 * decimal numbers (NR1/NR2/NR3) with an optional unit suffix and SI
 * multiplier (`1500MV`, `100 ms`, `10KHZ`), MIN/MAX/DEF, booleans ON/OFF/1/0.
 */
import { ScpiError } from './scpi-errors.ts';

export interface NumberSpec {
  /** Base unit accepted as a suffix, e.g. 'V', 'A', 'S', 'HZ'. */
  unit?: string;
  min: number;
  max: number;
  /** Value for DEF (defaults to min). */
  def?: number;
}

const NUMBER = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-z]*)$/;

/** SCPI multiplier mnemonics (SCPI-99 vol. 1, 7.7.3 — from memory): M is milli, MA mega, except MHZ and MOHM. */
function multiplierFor(prefix: string, unit: string): number | null {
  if (prefix === '') return 1;
  if (prefix === 'M') return unit === 'HZ' || unit === 'OHM' ? 1e6 : 1e-3;
  const table: Record<string, number> = {
    EX: 1e18,
    PE: 1e15,
    T: 1e12,
    G: 1e9,
    MA: 1e6,
    K: 1e3,
    U: 1e-6,
    N: 1e-9,
    P: 1e-12,
  };
  return table[prefix] ?? null;
}

export function parseNumber(text: string | undefined, spec: NumberSpec, field: string): number {
  if (text === undefined || text === '') throw new ScpiError('missingParameter', field);
  const upper = text.toUpperCase();
  if (upper === 'MIN' || upper === 'MINIMUM') return spec.min;
  if (upper === 'MAX' || upper === 'MAXIMUM') return spec.max;
  if (upper === 'DEF' || upper === 'DEFAULT') return spec.def ?? spec.min;
  const m = NUMBER.exec(text);
  if (!m) throw new ScpiError('dataType', `${field} expects a number`);
  let value = Number(m[1]);
  const suffix = (m[2] as string).toUpperCase();
  if (suffix !== '') {
    const unit = spec.unit?.toUpperCase();
    if (!unit) throw new ScpiError('dataType', `${field} takes no unit`);
    const special = suffix === 'MHZ' || suffix === 'MOHM' ? suffix : null;
    const prefix = special ? 'M' : suffix.endsWith(unit) ? suffix.slice(0, suffix.length - unit.length) : null;
    const scale = prefix === null ? null : multiplierFor(prefix, unit);
    if (scale === null) throw new ScpiError('dataType', `${field} unit "${m[2]}"`);
    value *= scale;
  }
  if (!Number.isFinite(value)) throw new ScpiError('dataType', field);
  if (value < spec.min || value > spec.max) {
    throw new ScpiError('dataOutOfRange', `${field} ${value} outside ${spec.min}..${spec.max}`);
  }
  return value;
}

export function parseBoolean(text: string | undefined, field: string): boolean {
  if (text === undefined || text === '') throw new ScpiError('missingParameter', field);
  const upper = text.toUpperCase();
  if (upper === 'ON' || upper === '1') return true;
  if (upper === 'OFF' || upper === '0') return false;
  throw new ScpiError('illegalParameterValue', `${field} expects ON|OFF`);
}

/** NR3 with a sign, e.g. `+1.23450000E+04` (the shape counters and meters commonly send). */
export function formatNr3(value: number, significantDigits = 12): string {
  const text = value.toExponential(significantDigits - 1).toUpperCase();
  const withSign = text.startsWith('-') ? text : `+${text}`;
  return withSign.replace(/E([+-])(\d)$/, 'E$10$2');
}

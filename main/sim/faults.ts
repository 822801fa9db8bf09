/**
 * Scriptable faults for the simulated instruments (a JSON file, zod-checked):
 * drop the connection, delay a reply past the host's timeout, send garbage,
 * push an error onto the queue, stop answering. Each is triggered at a bench
 * time (`atS`, seconds since the bench started) or at the n-th reading of
 * its device (`atReading`, 1-based; readings are measurement queries).
 */
import { z } from 'zod';
import type { Clock } from '../time/clock.ts';
import type { ReplyAction } from './device-link.ts';
import type { Rng } from './prng.ts';
import type { DeviceFaultHooks, ScpiDevice } from './scpi-device.ts';

const trigger = {
  device: z.enum(['supply', 'counter', 'thermometer', 'chamber']),
  atS: z.number().nonnegative().optional(),
  atReading: z.number().int().positive().optional(),
};

export const faultSchema = z
  .discriminatedUnion('type', [
    z.object({ type: z.literal('drop'), ...trigger }),
    z.object({
      type: z.literal('delay'),
      ...trigger,
      delayS: z.number().positive(),
      count: z.number().int().positive().default(1),
    }),
    z.object({ type: z.literal('garbage'), ...trigger, count: z.number().int().positive().default(1) }),
    z.object({
      type: z.literal('error'),
      ...trigger,
      code: z
        .number()
        .int()
        .refine((c) => c !== 0, 'code must not be 0'),
      message: z.string().min(1),
    }),
    z.object({ type: z.literal('silence'), ...trigger, durationS: z.number().positive().optional() }),
  ])
  .refine((f) => (f.atS === undefined) !== (f.atReading === undefined), {
    message: 'give exactly one of atS or atReading',
    path: ['atS'],
  });

export const faultScriptSchema = z.object({ faults: z.array(faultSchema) });

export type FaultSpec = z.infer<typeof faultSchema>;
export type FaultScript = z.infer<typeof faultScriptSchema>;

export class FaultScriptError extends Error {
  override name = 'FaultScriptError';
}

export function parseFaultScript(value: unknown, source = 'faults'): FaultScript {
  const result = faultScriptSchema.safeParse(value);
  if (!result.success) {
    const detail = result.error.issues.map((i) => `${i.path.join('.') || '(root)'}: ${i.message}`).join('; ');
    throw new FaultScriptError(`${source}: invalid fault script — ${detail}`);
  }
  return result.data;
}

/** Bytes a confused instrument might send: no newline inside, one at the end. */
function garbageBytes(rng: Rng): Uint8Array {
  const bytes = new Uint8Array(16);
  for (let i = 0; i < 15; i++) {
    let b = Math.floor(rng.uniform() * 256);
    if (b === 0x0a) b = 0xff;
    bytes[i] = b;
  }
  bytes[15] = 0x0a;
  return bytes;
}

/** The faults of one device, armed on the bench clock. */
export class DeviceFaults implements DeviceFaultHooks {
  readonly #device: ScpiDevice;
  readonly #clock: Clock;
  readonly #rng: Rng;
  readonly #byReading: FaultSpec[];
  readonly #cancels: (() => void)[] = [];
  #pendingDelays: number[] = [];
  #pendingGarbage = 0;
  #silentUntilS: number | null = null;
  /** Log of faults that went off, for tests and the sim CLI. */
  readonly fired: { type: FaultSpec['type']; atS: number }[] = [];

  constructor(device: ScpiDevice, specs: readonly FaultSpec[], clock: Clock, rng: Rng, benchStartS: number) {
    this.#device = device;
    this.#clock = clock;
    this.#rng = rng;
    this.#byReading = specs.filter((f) => f.atReading !== undefined);
    for (const spec of specs) {
      if (spec.atS === undefined) continue;
      const dueIn = Math.max(0, benchStartS + spec.atS - clock.now());
      this.#cancels.push(clock.setTimer(dueIn, () => this.#fireTimed(spec)));
    }
    device.faults = this;
  }

  #fireTimed(spec: FaultSpec): void {
    this.fired.push({ type: spec.type, atS: this.#clock.now() });
    switch (spec.type) {
      case 'drop':
        this.#device.dropAllLinks(new Error('connection dropped by the simulated instrument (fault)'));
        return;
      case 'delay':
        for (let i = 0; i < spec.count; i++) this.#pendingDelays.push(spec.delayS);
        return;
      case 'garbage':
        this.#pendingGarbage += spec.count;
        return;
      case 'error':
        this.#device.pushError(spec.code, spec.message);
        return;
      case 'silence':
        this.#silentUntilS =
          spec.durationS === undefined ? Number.POSITIVE_INFINITY : this.#clock.now() + spec.durationS;
        return;
    }
  }

  silent(): boolean {
    if (this.#silentUntilS === null) return false;
    if (this.#clock.now() < this.#silentUntilS) return true;
    this.#silentUntilS = null;
    return false;
  }

  replyAction(reading: number | null): ReplyAction {
    if (this.silent()) return { kind: 'silent' };
    if (reading !== null) {
      for (const spec of this.#byReading) {
        if (spec.atReading !== reading) continue;
        this.fired.push({ type: spec.type, atS: this.#clock.now() });
        switch (spec.type) {
          case 'drop':
            return { kind: 'drop' };
          case 'delay':
            return { kind: 'delay', delayS: spec.delayS };
          case 'garbage':
            return { kind: 'garbage', bytes: garbageBytes(this.#rng) };
          case 'error':
            this.#device.pushError(spec.code, spec.message);
            break;
          case 'silence':
            this.#silentUntilS =
              spec.durationS === undefined ? Number.POSITIVE_INFINITY : this.#clock.now() + spec.durationS;
            return { kind: 'silent' };
        }
      }
    }
    const delayS = this.#pendingDelays.shift();
    if (delayS !== undefined) return { kind: 'delay', delayS };
    if (this.#pendingGarbage > 0) {
      this.#pendingGarbage--;
      return { kind: 'garbage', bytes: garbageBytes(this.#rng) };
    }
    return { kind: 'normal' };
  }

  /** Cancels timers not yet fired. */
  dispose(): void {
    for (const cancel of this.#cancels) cancel();
    this.#cancels.length = 0;
  }
}

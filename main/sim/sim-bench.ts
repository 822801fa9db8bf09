/**
 * The simulated bench: one clock, a two-channel supply, a counter and a
 * thermometer wired to a DUT model, plus scripted faults. Every device
 * speaks SCPI over any Transport: `bench.transport('counter')` gives an
 * in-process one; serveSimBench (tcp-server.ts) puts them on TCP ports.
 */
import type { Transport } from '../instruments/transport.ts';
import type { RoleName } from '../instruments/roles.ts';
import type { Clock } from '../time/clock.ts';
import { ambientAt, ambientProfileSchema, DEFAULT_AMBIENT } from './ambient.ts';
import type { z } from 'zod';
import { builtinDut, type BuiltinDutName } from './builtin-duts.ts';
import type { DutParams } from './dut-params.ts';
import { DutRuntime } from './dut-runtime.ts';
import { DeviceFaults, parseFaultScript, type FaultSpec } from './faults.ts';
import type { faultScriptSchema, faultSchema } from './faults.ts';
import { createRng } from './prng.ts';
import type { ScpiDevice } from './scpi-device.ts';
import { SimCounter, type NoSignalReply, type SimCounterState } from './sim-counter.ts';
import { SimSupply } from './sim-supply.ts';
import { SimThermometer } from './sim-thermometer.ts';
import { createSimTransport } from './sim-transport.ts';
import { ChamberThermal, type ChamberThermalState } from './chamber-thermal.ts';
import { SimChamber } from './sim-chamber.ts';
import type { SupplyChannel, SupplyChannelState } from './supply-channel.ts';

export interface SimBenchOptions {
  clock: Clock;
  /** A built-in DUT by name, or parameters (from a file via loadDutParamsFile). Default 'relaxation'. */
  dut?: DutParams | BuiltinDutName;
  /** Seed of every random stream on the bench. Default 1. */
  seed?: number;
  /** Fault script (validated here; see faults.ts). */
  faults?: z.input<typeof faultScriptSchema> | readonly z.input<typeof faultSchema>[];
  /** Ambient temperature profile (validated here). Default: 23 °C ± 1.5 °C over 6 h. */
  ambient?: z.input<typeof ambientProfileSchema>;
  /** How the counter shows "no oscillation". Default 'not-a-number' (9.91E37). */
  counterNoSignal?: NoSignalReply;
  /** Supply output slew, V/s. Default 1000. */
  supplySlewVPerS?: number;
  /** The simulated chamber around the DUT (idle until first run). */
  chamber?: SimChamberOptions;
}

export interface SimChamberOptions {
  /** Air time constant, s. Default 180. */
  airTauS?: number;
  /** Fractional overshoot of the air on a step (0 = first-order approach). Default 0. */
  overshootFraction?: number;
  /** Fastest ramp the chamber can do, °C/min. Default 5. */
  hardwareRampCPerMin?: number;
}

export interface SimBenchSnapshot {
  timeS: number;
  supply: [SupplyChannelState, SupplyChannelState];
  counter: SimCounterState;
  thermometer: { temperatureC: number; readings: number };
  chamber: ChamberThermalState;
  dut: {
    id: string;
    tuneNodeV: number;
    supplyV: number;
    temperatureC: number;
    frequencyHz: number;
    oscillating: boolean;
  };
}

export interface SimBench {
  readonly clock: Clock;
  readonly dutParams: DutParams;
  readonly dut: DutRuntime;
  readonly supply: SimSupply;
  readonly counter: SimCounter;
  readonly thermometer: SimThermometer;
  readonly chamber: SimChamber;
  readonly devices: Readonly<Record<RoleName, ScpiDevice>>;
  readonly faults: Readonly<Record<RoleName, DeviceFaults>>;
  /** A new in-process Transport (one connection) to the device playing `role`. */
  transport(role: RoleName): Transport;
  /** Noise-free truth of the whole bench now, for tests and safety checks. */
  snapshot(): SimBenchSnapshot;
  /** Cancels fault timers and drops every connection. */
  close(): void;
}

export const SUPPLY_CONTROL_CHANNEL = 1;
export const SUPPLY_DUT_CHANNEL = 2;

export function createSimBench(options: SimBenchOptions): SimBench {
  const { clock } = options;
  const dutParams = typeof options.dut === 'object' ? options.dut : builtinDut(options.dut ?? 'relaxation');
  const rng = createRng(options.seed ?? 1);
  const ambient = options.ambient ? ambientProfileSchema.parse(options.ambient) : DEFAULT_AMBIENT;
  const startS = clock.now();
  const ambientCAt = (tS: number): number => ambientAt(ambient, tS - startS);
  const hardwareRampCPerMin = options.chamber?.hardwareRampCPerMin ?? 5;
  const thermal = new ChamberThermal(
    {
      ambientCAt,
      airTauS: options.chamber?.airTauS ?? 180,
      dutTauS: dutParams.thermalTauS,
      overshootFraction: options.chamber?.overshootFraction ?? 0,
      hardwareRampCPerMin,
    },
    startS,
  );
  // The DUT (and the thermometer on it) follow the chamber; an idle chamber leaves them in lab air.
  const dutCAt = (tS: number): number => thermal.dutCAt(tS);
  let dut: DutRuntime | null = null;

  const supply = new SimSupply({
    clock,
    rng: rng.fork('supply'),
    slewVPerS: options.supplySlewVPerS,
    loadsOhm: [dutParams.tuning.inputResistanceOhm, dutParams.supply.nominalV / dutParams.supply.currentA],
    powerOn: [
      { setpointV: 0, currentLimitA: 0.1, ovpV: 22, outputOn: false },
      { setpointV: dutParams.supply.nominalV, currentLimitA: 0.1, ovpV: 22, outputOn: true },
    ],
    beforeChange: () => dut?.advanceTo(clock.now()),
  });
  const [control, dutSupply] = supply.channels as [SupplyChannel, SupplyChannel];
  const runtime = new DutRuntime(
    dutParams,
    {
      tuneSourceAt: (t) => control.pieceAt(t),
      supplyVAt: (t) => dutSupply.outputVAt(t),
      poweredSinceS: (t) => dutSupply.poweredSinceS(t),
      temperatureCAt: dutCAt,
    },
    rng.fork('dut'),
    startS,
  );
  dut = runtime;
  const counter = new SimCounter({
    clock,
    gate: (t0, gateS) => runtime.gate(t0, gateS),
    noSignal: options.counterNoSignal,
  });
  const thermometer = new SimThermometer({ clock, rng: rng.fork('thermometer'), ambientCAt: dutCAt });
  const chamber = new SimChamber({ clock, rng: rng.fork('chamber'), thermal, hardwareRampCPerMin });
  const devices = {
    supply: supply.device,
    counter: counter.device,
    thermometer: thermometer.device,
    chamber: chamber.device,
  };

  const script =
    options.faults === undefined
      ? { faults: [] }
      : Array.isArray(options.faults)
        ? { faults: options.faults }
        : options.faults;
  const specs: readonly FaultSpec[] = parseFaultScript(script, 'faults').faults;
  const faultsFor = (role: RoleName): DeviceFaults =>
    new DeviceFaults(
      devices[role],
      specs.filter((f) => f.device === role),
      clock,
      rng.fork(`faults:${role}`),
      startS,
    );
  const faults = {
    supply: faultsFor('supply'),
    counter: faultsFor('counter'),
    thermometer: faultsFor('thermometer'),
    chamber: faultsFor('chamber'),
  };

  return {
    clock,
    dutParams,
    dut: runtime,
    supply,
    counter,
    thermometer,
    chamber,
    devices,
    faults,
    transport: (role) => createSimTransport(devices[role]),
    snapshot() {
      const now = clock.now();
      const c = runtime.conditionsAt(now);
      const frequencyHz = runtime.frequencyHzAt(now);
      return {
        timeS: now,
        supply: [supply.state(1), supply.state(2)],
        counter: counter.state(),
        thermometer: thermometer.state(),
        chamber: thermal.state(now),
        dut: {
          id: dutParams.id,
          tuneNodeV: c.tuneNodeV,
          supplyV: c.supplyV,
          temperatureC: c.temperatureC,
          frequencyHz,
          oscillating: frequencyHz > 0,
        },
      };
    },
    close() {
      for (const role of ['supply', 'counter', 'thermometer', 'chamber'] as const) {
        faults[role].dispose();
        devices[role].dropAllLinks(new Error('simulated bench closed'));
      }
    },
  };
}

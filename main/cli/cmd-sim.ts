/**
 * `tunebench sim`: serves the simulated bench on TCP ports so any SCPI
 * client can talk to it — supply on base-port, counter on base-port+1,
 * thermometer on base-port+2, temperature chamber on base-port+3 — until
 * SIGINT/SIGTERM.
 */
import { builtinDut } from '../sim/builtin-duts.ts';
import type { FaultScript } from '../sim/faults.ts';
import { loadFaultScriptFile } from './sim-files.ts';
import type { NoSignalReply } from '../sim/sim-counter.ts';
import { serveSimBench } from '../sim/tcp-server.ts';
import { RealClock } from '../time/real-clock.ts';
import { parseFlags } from './flags.ts';
import { resolveSimDut } from './sim-dut.ts';
import { UsageError, type CliCommand, type CliIo } from './types.ts';

const USAGE = `usage: tunebench sim [--host 127.0.0.1] [--base-port 5025] [--dut relaxation|varactor|FILE.json]
                     [--seed N] [--faults FILE.json] [--no-signal nan|zero|silent]

Serves a simulated bench: a two-channel supply (channel 1 drives the DUT's
tuning port; channel 2 powers the DUT and starts on at its nominal voltage),
a frequency counter, a thermometer on the DUT and a temperature chamber around
it, all speaking SCPI over raw TCP.

  --host       address to listen on (default 127.0.0.1, loopback only)
  --base-port  supply port; counter +1, thermometer +2, chamber +3 (default 5025; 0 = any free ports)
  --dut        built-in model (relaxation, varactor) or a DUT model file (JSON; keys in resources/docs/reference.md)
  --seed       integer seed of all simulated noise (default 1)
  --faults     fault script (JSON): drops, delays, garbage, errors, silence
  --no-signal  how the counter shows no oscillation: nan (9.91E37, default), zero, silent
Runs until Ctrl+C (SIGINT) or SIGTERM.
`;

const NO_SIGNAL: Record<string, NoSignalReply> = { nan: 'not-a-number', zero: 'zero', silent: 'silent' };

async function resolveFaults(value: string | undefined): Promise<FaultScript | undefined> {
  if (value === undefined) return undefined;
  try {
    return await loadFaultScriptFile(value);
  } catch (error) {
    throw new UsageError(`--faults: ${(error as Error).message}`);
  }
}

function parseInteger(value: string | undefined, flag: string, min: number, max: number, fallback: number): number {
  if (value === undefined) return fallback;
  const n = Number(value);
  if (!/^\d+$/.test(value) || n < min || n > max)
    throw new UsageError(`--${flag} "${value}": expected an integer ${min}..${max}`);
  return n;
}

/** Aborts on SIGINT/SIGTERM when the caller gave no signal of its own. */
function processStopSignal(): { signal: AbortSignal; dispose(): void } {
  const controller = new AbortController();
  const stop = (): void => controller.abort();
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
  return {
    signal: controller.signal,
    dispose: () => {
      process.off('SIGINT', stop);
      process.off('SIGTERM', stop);
    },
  };
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const flags = parseFlags(argv, { values: ['host', 'base-port', 'dut', 'seed', 'faults', 'no-signal'] });
  if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
  const host = flags.values.get('host') ?? '127.0.0.1';
  const basePort = parseInteger(flags.values.get('base-port'), 'base-port', 0, 65532, 5025);
  const seed = parseInteger(flags.values.get('seed'), 'seed', 0, 2 ** 32 - 1, 1);
  const noSignalFlag = flags.values.get('no-signal') ?? 'nan';
  const noSignal = NO_SIGNAL[noSignalFlag];
  if (!noSignal) throw new UsageError(`--no-signal "${noSignalFlag}": expected nan, zero or silent`);
  const chosen = await resolveSimDut(flags.values.get('dut'));
  const dut = typeof chosen === 'string' ? builtinDut(chosen) : chosen;
  const faults = await resolveFaults(flags.values.get('faults'));

  let served;
  try {
    served = await serveSimBench({
      host,
      basePort,
      dut,
      seed,
      faults,
      counterNoSignal: noSignal,
      clock: new RealClock(),
    });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'EADDRINUSE' || code === 'EACCES' || code === 'EADDRNOTAVAIL') {
      throw new UsageError(
        `--base-port ${basePort} / --host ${host}: cannot listen (${code}); choose other ports or host`,
      );
    }
    throw error;
  }
  const own = io.signal ? null : processStopSignal();
  const signal = io.signal ?? (own as { signal: AbortSignal }).signal;
  const a = served.addresses;
  io.stdout.write(
    [
      `simulated bench — DUT ${dut.id} (${dut.kind}), seed ${seed}; simulated instruments only, no hardware is driven`,
      `  supply       ${a.supply}   (channel 1 → tuning port; channel 2 → DUT supply, on at ${dut.supply.nominalV} V)`,
      `  counter      ${a.counter}`,
      `  thermometer  ${a.thermometer}   (on the DUT)`,
      `  chamber      ${a.chamber}   (idle until run; the DUT lags its air)`,
      'Ctrl+C stops.',
      '',
    ].join('\n'),
  );
  if (host !== '127.0.0.1' && host !== 'localhost' && host !== '::1') {
    io.stderr.write(`caution: listening on ${host}, beyond loopback; the simulator has no access control\n`);
  }
  try {
    await new Promise<void>((resolve) => {
      if (signal.aborted) return resolve();
      signal.addEventListener('abort', () => resolve(), { once: true });
    });
  } finally {
    own?.dispose();
    await served.close();
  }
  io.stdout.write('simulated bench stopped\n');
  return 0;
}

export const simCommand: CliCommand = {
  name: 'sim',
  usage: USAGE,
  run,
};

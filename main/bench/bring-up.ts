/**
 * Connect-only bring-up of a bench (`tunebench check`): each role opened on
 * its own, so one failing instrument does not hide the others, and asked
 * only questions — identity, error queue, what its profile says it has, the
 * supply's control channel state, one counter reading, one temperature.
 * Nothing here turns an output on or changes a supply setting.
 */
import type { BenchConfig } from '../../app/contract/plans.ts';
import { openInstrument } from '../instruments/open-instrument.ts';
import { parseAddress } from '../instruments/address.ts';
import type { Chamber, Counter, RoleName, Supply, Thermometer } from '../instruments/roles.ts';
import { ScpiSession } from '../instruments/scpi-session.ts';
import { createSimBench, type SimBench } from '../sim/sim-bench.ts';
import type { Clock } from '../time/clock.ts';
import { SIM_BENCH_CONFIG } from './assemble.ts';
import { checkBenchChannels } from './bench-checks.ts';
import { rolesSuggestedBy } from './role-probe.ts';

export interface RoleCheck {
  role: RoleName;
  address: string;
  pass: boolean;
  idn: string | null;
  /** What was found, in order (identity first). */
  findings: string[];
  /** Why it failed, when it did. */
  problem: string | null;
}

type Driver = Supply | Counter | Thermometer | Chamber;

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

function sessionOf(driver: Driver): ScpiSession | null {
  const candidate = (driver as { session?: unknown }).session;
  return candidate instanceof ScpiSession ? candidate : null;
}

async function errorQueue(driver: Driver): Promise<string> {
  const session = sessionOf(driver);
  if (session === null) return 'error queue not readable';
  const entries = await session.drainErrors();
  return entries.length === 0
    ? 'error queue empty'
    : `error queue held ${entries.map((e) => `${e.code} "${e.message}"`).join(', ')}`;
}

async function probe(role: RoleName, driver: Driver, bench: BenchConfig): Promise<string[]> {
  const findings: string[] = [];
  findings.push(await errorQueue(driver));
  if (role === 'supply') {
    const supply = driver as Supply;
    findings.push(`${supply.capabilities.channels} channel(s) in its profile`);
    for (const [label, channel] of [
      ['control', bench.supply.controlChannel],
      ['DUT supply', bench.supply.dutSupplyChannel],
    ] as const) {
      const on = await supply.getOutput(channel);
      const volts = await supply.getVoltageSetpoint(channel);
      findings.push(`${label} channel ${channel}: output ${on ? 'ON' : 'off'}, setpoint ${volts} V`);
    }
  } else if (role === 'counter') {
    const counter = driver as Counter;
    const reading = await counter.readFrequency();
    findings.push(
      reading.status === 'ok'
        ? `reading ${reading.frequencyHz} Hz (gate ${counter.gateS} s)`
        : `reading: no signal (${reading.cause}) — the counter answers; is the DUT powered?`,
    );
  } else if (role === 'thermometer') {
    findings.push(`reading ${(await (driver as Thermometer).readTemperature()).toFixed(2)} °C`);
  } else {
    const chamber = driver as Chamber;
    findings.push(
      `air ${(await chamber.readAirTemperature()).toFixed(2)} °C, setpoint ${await chamber.getSetpoint()} °C`,
    );
    if (chamber.capabilities.runStop) findings.push((await chamber.getRunning()) ? 'running' : 'stopped');
  }
  return findings;
}

/** Checks every role of `config` ('sim': the built-in simulated bench). Never writes a supply setting. */
export async function bringUpBench(
  config: BenchConfig | 'sim',
  options: { clock: Clock; userProfileDir?: string },
): Promise<RoleCheck[]> {
  const bench = config === 'sim' ? SIM_BENCH_CONFIG : config;
  checkBenchChannels(bench);
  const entries: [RoleName, { address: string; profile?: string | undefined }][] = [
    ['supply', bench.supply],
    ['counter', bench.counter],
  ];
  if (bench.thermometer) entries.push(['thermometer', bench.thermometer]);
  if (bench.chamber) entries.push(['chamber', bench.chamber]);
  let sim: SimBench | null = null;
  const simFor = (): SimBench => (sim ??= createSimBench({ clock: options.clock }));
  const results: RoleCheck[] = [];
  try {
    for (const [role, entry] of entries) {
      const check: RoleCheck = { role, address: entry.address, pass: false, idn: null, findings: [], problem: null };
      results.push(check);
      let driver: Driver | null = null;
      try {
        const isSim = parseAddress(entry.address).kind === 'sim';
        driver = await openInstrument(
          role,
          { address: entry.address, profile: entry.profile },
          {
            clock: options.clock,
            sim: isSim ? (simRole) => simFor().transport(simRole) : undefined,
            userProfileDir: options.userProfileDir,
            reconnect: { attempts: 0, delayS: 0.5 },
          },
        );
        check.idn = (await driver.identify()).idn;
        // The identity first: a role's questions asked of another kind of instrument only time out.
        const suggested = rolesSuggestedBy(check.idn);
        if (suggested.length > 0 && !suggested.includes(role)) {
          check.problem = `identifies as "${check.idn}", which reads like a ${suggested.join(' or ')}: are two addresses swapped?`;
        } else {
          check.findings.push(...(await probe(role, driver, bench)));
          check.pass = true;
        }
      } catch (error) {
        const last = driver === null ? null : (sessionOf(driver)?.lastCommand ?? null);
        check.problem = `${messageOf(error)}${last !== null && !messageOf(error).includes('last command') ? ` (last command sent: ${last})` : ''}`;
      } finally {
        await driver?.close().catch(() => undefined);
      }
    }
  } finally {
    (sim as SimBench | null)?.close();
  }
  return results;
}

/** One line per role: `supply  PASS  <idn> at <address> — findings` or `FAIL … — problem`. */
export function formatRoleCheck(check: RoleCheck): string {
  const who = `${check.idn ?? '(no identity)'} at ${check.address}`;
  const what = [...check.findings, ...(check.problem === null ? [] : [check.problem])].join('; ');
  return `${check.role.padEnd(11)} ${check.pass ? 'PASS' : 'FAIL'}  ${who}${what === '' ? '' : ` — ${what}`}`;
}

/**
 * The simulated bench served on TCP (ephemeral ports) with a misbehaving
 * proxy in front of the supply and the counter, fast-timeout copies of the
 * shipped profiles, and bench/plan files in a temporary folder: what the
 * hostile-instrument tests drive through the CLI. The simulated supply's
 * real state is read from `served.bench`, never through a proxy.
 */
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SHIPPED_PROFILE_DIR } from '../../main/instruments/profile-loader.ts';
import { serveSimBench, type ServedSimBench } from '../../main/sim/tcp-server.ts';
import { startScpiProxy, type ProxyRules, type ScpiProxy } from '../testing/scpi-proxy.ts';

export interface HostileBench {
  served: ServedSimBench;
  supplyProxy: ScpiProxy;
  counterProxy: ScpiProxy;
  dir: string;
  benchFile: string;
  runsDir: string;
  /** Writes `plan` as JSON and returns its path. */
  planFile(plan: unknown, name?: string): Promise<string>;
  close(): Promise<void>;
}

function hostPort(address: string): { host: string; port: number } {
  const url = new URL(address);
  return { host: url.hostname, port: Number(url.port) };
}

/** A shipped profile with short timeouts, so a wedged or silent instrument costs tenths of a second. */
async function fastProfile(dir: string, role: 'supply' | 'counter'): Promise<string> {
  const profile = JSON.parse(await readFile(join(SHIPPED_PROFILE_DIR, `${role}-scpi.json`), 'utf8')) as Record<
    string,
    unknown
  >;
  profile.timeouts = role === 'counter' ? { defaultS: 0.4, measureMarginS: 0.3 } : { defaultS: 0.4 };
  const path = join(dir, `${role}-fast.json`);
  await writeFile(path, JSON.stringify(profile));
  return path;
}

/**
 * `rules` for the proxies in front of the supply and the counter; `campaign: true` adds the simulated
 * thermometer and chamber to the bench file (straight to the simulator, no proxy), as a campaign needs.
 */
export async function hostileBench(
  rules: { supply?: ProxyRules; counter?: ProxyRules } = {},
  options: { campaign?: boolean } = {},
): Promise<HostileBench> {
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-hostile-'));
  const served = await serveSimBench({ basePort: 0, seed: 11 });
  const supplyProxy = await startScpiProxy(hostPort(served.addresses.supply), rules.supply);
  const counterProxy = await startScpiProxy(hostPort(served.addresses.counter), rules.counter);
  const benchFile = join(dir, 'bench.json');
  await writeFile(
    benchFile,
    JSON.stringify({
      supply: {
        address: supplyProxy.address,
        profile: await fastProfile(dir, 'supply'),
        controlChannel: 1,
        dutSupplyChannel: 2,
      },
      counter: { address: counterProxy.address, profile: await fastProfile(dir, 'counter') },
      ...(options.campaign
        ? { thermometer: { address: served.addresses.thermometer }, chamber: { address: served.addresses.chamber } }
        : {}),
    }),
  );
  return {
    served,
    supplyProxy,
    counterProxy,
    dir,
    benchFile,
    runsDir: join(dir, 'runs'),
    async planFile(plan, name = 'plan.json') {
      const path = join(dir, name);
      await writeFile(path, JSON.stringify(plan));
      return path;
    },
    async close() {
      await supplyProxy.close();
      await counterProxy.close();
      await served.close();
      await rm(dir, { recursive: true, force: true });
    },
  };
}

/** Three points on the relaxation DUT's oscillating range, fixed settling, no edge refinement. */
export const SHORT_SWEEP = {
  points: [2.0, 2.5, 3.0],
  readingsPerPoint: 1,
  gateS: 0.05,
  settle: { mode: 'fixed', seconds: 0.05 },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: 0.02 },
  safe: { controlV: 0, outputOff: true },
};

/** Lines of a run's events.jsonl, parsed. */
export async function runEvents(runDir: string): Promise<{ type: string; [key: string]: unknown }[]> {
  const text = await readFile(join(runDir, 'events.jsonl'), 'utf8');
  return text
    .split('\n')
    .filter((line) => line.trim() !== '')
    .map((line) => JSON.parse(line) as { type: string });
}

/**
 * Sends a child two SIGINTs, 150 ms apart, once `ready()` holds (polled every 5 ms): a user pressing Ctrl-C twice
 * while the safe state is under way. `sent` gets the supply proxy's log length at each signal; `stop` ends the watch.
 */
export function interruptTwiceWhen(
  child: { kill(signal: NodeJS.Signals): boolean },
  ready: () => boolean,
  logLength: () => number,
): { sent: number[]; stop: () => void } {
  const sent: number[] = [];
  const watch = setInterval(() => {
    if (!ready() || sent.length > 0) return;
    clearInterval(watch);
    sent.push(logLength());
    child.kill('SIGINT');
    setTimeout(() => {
      sent.push(logLength());
      child.kill('SIGINT');
    }, 150);
  }, 5);
  return { sent, stop: () => clearInterval(watch) };
}

/**
 * Faults while `tunebench serve` holds the bench (issue 15 items 2–3 in
 * browser mode): a real serve process driven over its WebSocket API as the
 * page drives it, the simulated bench on TCP behind the misbehaving proxy in
 * this process, the supply's real state read from the simulator. Found by
 * probing: the service opened its bench without the reconnect hook, so a
 * supply whose replies wedged on its connection left the safe state
 * unconfirmed where the CLI reopens the link, writes again and confirms.
 * Shipped profiles (serve takes profiles by name), so timeouts are 2 s.
 */
import { readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { openApi, startServe, stubRendererDir, type ApiClient, type ServeChild } from '../testing/serve-process.ts';
import { misbehave, type ProxyContext } from '../testing/scpi-proxy.ts';
import { SHORT_SWEEP, hostileBench, runEvents, type HostileBench } from './hostile-bench.ts';

let bench: HostileBench | null = null;
let serve: ServeChild | null = null;
let api: ApiClient | null = null;
let rendererDir = '';
afterEach(async () => {
  api?.close();
  serve?.process.kill('SIGTERM');
  await serve?.exited;
  await bench?.close();
  if (rendererDir) await rm(rendererDir, { recursive: true, force: true });
  [bench, serve, api, rendererDir] = [null, null, null, ''];
});

type RunEnded = { type: 'run-ended'; meta: { id: string; status: string } };
type Status = { safeState: { reached: boolean; outputOff: boolean; failures: string[] } | null };

/** serve on the hostile bench, connected over the API with the shipped profiles, and one sweep run to its end. */
async function sweepUnderServe(b: HostileBench): Promise<{ ended: RunEnded['meta']; status: Status }> {
  rendererDir = await stubRendererDir();
  serve = await startServe({ runsDir: b.runsDir, rendererDir });
  api = await openApi(serve.origin, serve.token);
  const connected = await api.call('connect', [
    {
      supply: { address: b.supplyProxy.address, profile: 'supply-scpi', controlChannel: 1, dutSupplyChannel: 2 },
      counter: { address: b.counterProxy.address, profile: 'counter-scpi' },
    },
  ]);
  expect(connected.ok, JSON.stringify(connected.error)).toBe(true);
  const started = await api.call('startSweep', [SHORT_SWEEP, 'serve-fault']);
  expect(started.ok, JSON.stringify(started.error)).toBe(true);
  const client = api;
  const ended = (): RunEnded | undefined => client.events.find((e): e is RunEnded => e.type === 'run-ended');
  const deadline = Date.now() + 60_000;
  while (!ended() && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
  const status = await client.call('getBenchStatus', []);
  return { ended: (ended() as RunEnded).meta, status: status.result as Status };
}

describe('faults while serve holds the bench', () => {
  it(
    'a supply wedged on its connection mid-sweep: the safe state reopens the link, writes again and confirms',
    { timeout: 90_000 },
    async () => {
      let wedged = false;
      const wedge = misbehave.unterminatedReplies(1);
      const b = await hostileBench({
        supply: {
          command: (line) => {
            if (line === 'INST:NSEL 1;:SOUR:VOLT 2.5') wedged = true;
            return line;
          },
          reply: (line: string, ctx: ProxyContext) => (wedged && wedge.reply ? wedge.reply(line, ctx) : `${line}\n`),
        },
      });
      bench = b;
      const { ended, status } = await sweepUnderServe(b);
      // The run says what happened: aborted on the supply's timeout, its safe state confirmed after the reopen.
      expect(ended.status).toBe('aborted');
      expect(status.safeState).toMatchObject({ reached: true, outputOff: true, failures: [] });
      const events = await runEvents(join(b.runsDir, ended.id));
      expect(events.find((e) => e.type === 'abort')).toMatchObject({ reason: 'timeout' });
      expect(events.filter((e) => e.type === 'safe-state').map((e) => [e.step, e.ok, e.afterReconnect])).toEqual([
        ['control-voltage 0 V', true, true],
        ['output-off', true, true],
      ]);
      expect(b.supplyProxy.connections).toBe(2);
      // No reading after the wedge is recorded as good: the one ok row is the 2 V point, read before it.
      const csv = (await readFile(join(b.runsDir, ended.id, 'samples.csv'), 'utf8')).trim().split('\n');
      const header = (csv[0] as string).split(',');
      const ok = csv.slice(1).filter((line) => line.split(',')[header.indexOf('status')] === 'ok');
      expect(ok.map((line) => Number(line.split(',')[header.indexOf('control_v')]))).toEqual([2]);
      expect(b.served.bench.snapshot().supply[0]).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );

  it(
    'a counter slipping one query late from its first reading: no value recorded, the run aborted, the supply safe',
    { timeout: 90_000 },
    async () => {
      const b = await hostileBench({ counter: misbehave.slipOneQuery(/^READ\?$/) });
      bench = b;
      const { ended, status } = await sweepUnderServe(b);
      expect(ended.status).toBe('aborted');
      expect(status.safeState).toMatchObject({ reached: true, outputOff: true });
      const csv = (await readFile(join(b.runsDir, ended.id, 'samples.csv'), 'utf8')).trim().split('\n');
      const header = (csv[0] as string).split(',');
      const statuses = csv.slice(1).map((line) => line.split(',')[header.indexOf('status')]);
      expect(statuses.filter((s) => s === 'ok')).toEqual([]);
      expect(b.served.bench.snapshot().supply[0]).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});

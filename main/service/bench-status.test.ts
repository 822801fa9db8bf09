import { describe, expect, it } from 'vitest';
import type { BenchStatus, ConnectionState } from '../../app/contract/bench-api.ts';
import { benchStatusSchema } from '../../app/contract/wire-schemas.ts';
import { BenchStatusTracker } from './bench-status.ts';

const CONNECTED: ConnectionState = {
  connected: true,
  simulated: true,
  roles: (['supply', 'counter', 'thermometer'] as const).map((role) => ({
    role,
    address: 'sim',
    idn: 'tunebench,SIM,0,1',
    simulated: true,
  })),
  error: null,
};

function tracker(): { t: BenchStatusTracker; seen: BenchStatus[]; tick: (s: number) => void } {
  const seen: BenchStatus[] = [];
  let ms = Date.parse('2026-03-04T05:06:07Z');
  const t = new BenchStatusTracker(
    (s) => seen.push(s),
    () => new Date(ms),
  );
  return { t, seen, tick: (s) => void (ms += s * 1000) };
}

describe('bench status tracker', () => {
  it('shows a drift run from its own rows and events, then the safe state with its time', () => {
    const { t, seen, tick } = tracker();
    t.connected(CONNECTED);
    t.idle({ controlSetV: 0, controlMeasV: 0.0001, frequencyHz: null, temperatureC: 23.9, output: false, lost: {} });
    expect(t.status.output).toBe(false);
    t.runStarted('20260304-050607-osc-7');
    t.runEvent({ time_s: 0.1, type: 'output-on', channel: 1, controlV: 2.5 });
    t.runRow({ time_s: 3, control_v: 2.5, frequency_hz: 13_781.25, temperature_c: 24.125, status: 'ok' });
    // Idle polls do not reach the status while a run holds the bench.
    t.idle({ controlSetV: 0, controlMeasV: 0, frequencyHz: null, temperatureC: null, output: false, lost: {} });
    expect(t.status).toMatchObject({
      source: 'run',
      output: true,
      controlSetV: 2.5,
      frequencyHz: 13_781.25,
      temperatureC: 24.125,
    });
    tick(5);
    t.runEvent({ time_s: 5, type: 'pause' });
    expect(t.status.paused).toEqual({ since: '2026-03-04T05:06:12.000Z', controlV: 2.5 });
    t.runEvent({ time_s: 9, type: 'resume' });
    expect(t.status.paused).toBeNull();
    tick(10);
    t.runEvent({ time_s: 20, type: 'safe-state', step: 'control-voltage 0 V', ok: true });
    t.runEvent({ time_s: 20.1, type: 'safe-state', step: 'output-off', ok: true });
    t.runEvent({ time_s: 20.2, type: 'end', status: 'complete' });
    t.runEnded();
    expect(t.status).toMatchObject({
      source: 'idle',
      output: false,
      controlSetV: 0,
      safeState: {
        runId: '20260304-050607-osc-7',
        reached: true,
        at: '2026-03-04T05:06:22.000Z',
        outputOff: true,
        failures: [],
      },
    });
    // Every status pushed passes the schema the browser checks events with.
    for (const status of seen) expect(benchStatusSchema.safeParse(status).success).toBe(true);
  });

  it('says the safe state was not reached when a step failed, naming it', () => {
    const { t } = tracker();
    t.connected(CONNECTED);
    t.runStarted('r1');
    t.runEvent({ time_s: 0, type: 'output-on', channel: 1, controlV: 1 });
    t.runEvent({ time_s: 1, type: 'link-lost', role: 'supply', error: 'socket closed' });
    expect(t.status.links.find((l) => l.role === 'supply')).toEqual({
      role: 'supply',
      state: 'lost',
      detail: 'socket closed',
    });
    t.runEvent({ time_s: 2, type: 'safe-state', step: 'control-voltage 0 V', ok: false, error: 'socket closed' });
    t.runEvent({ time_s: 2, type: 'safe-state', step: 'output-off', ok: false, error: 'socket closed' });
    t.runEvent({ time_s: 2, type: 'end', status: 'aborted' });
    t.runEnded();
    expect(t.status.output).toBe(true);
    expect(t.status.safeState).toMatchObject({
      reached: false,
      outputOff: false,
      failures: ['control-voltage 0 V: socket closed', 'output-off: socket closed'],
    });
  });

  it('marks one instrument lost while idle and up again when it answers', () => {
    const { t } = tracker();
    t.connected(CONNECTED);
    t.idle({
      controlSetV: 0,
      controlMeasV: null,
      frequencyHz: null,
      temperatureC: null,
      output: null,
      lost: { counter: 'link to tcp://127.0.0.1:5025 dropped' },
    });
    expect(t.status.links.map((l) => `${l.role}:${l.state}`)).toEqual(['supply:up', 'counter:lost', 'thermometer:up']);
    t.idle({ controlSetV: 0, controlMeasV: null, frequencyHz: 1e6, temperatureC: 22, output: false, lost: {} });
    expect(t.status.links.every((l) => l.state === 'up')).toBe(true);
  });

  it('a run that ends without its end event leaves the safe state unconfirmed', () => {
    const { t } = tracker();
    t.connected(CONNECTED);
    t.runStarted('r2');
    t.runEnded();
    expect(t.status.safeState).toMatchObject({ runId: 'r2', reached: false });
  });
});

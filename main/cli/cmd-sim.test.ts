import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { simCommand } from './cmd-sim.ts';
import { UsageError, type CliIo } from './types.ts';

function captureIo(signal?: AbortSignal): { io: CliIo; out: () => string; err: () => string } {
  let out = '';
  let err = '';
  return {
    io: {
      stdout: { write: (s: string | Uint8Array) => ((out += String(s)), true) },
      stderr: { write: (s: string | Uint8Array) => ((err += String(s)), true) },
      env: {},
      signal,
    },
    out: () => out,
    err: () => err,
  };
}

function tcpQuery(port: number, command: string): Promise<string> {
  return new Promise((resolve, reject) => {
    let text = '';
    const socket = connect(port, '127.0.0.1', () => socket.write(`${command}\n`));
    socket.on('data', (chunk) => {
      text += chunk.toString('utf8');
      const nl = text.indexOf('\n');
      if (nl >= 0) {
        socket.destroy();
        resolve(text.slice(0, nl));
      }
    });
    socket.on('error', reject);
  });
}

describe('tunebench sim', () => {
  it('serves four instruments (chamber on base-port + 3) on ephemeral ports and stops on abort', async () => {
    const controller = new AbortController();
    const { io, out } = captureIo(controller.signal);
    const running = simCommand.run(['--base-port', '0', '--seed', '2', '--dut', 'varactor'], io);
    for (let i = 0; i < 250 && !out().includes('chamber'); i++) await new Promise((r) => setTimeout(r, 20));
    const ports = [...out().matchAll(/tcp:\/\/127\.0\.0\.1:(\d+)/g)].map((m) => Number(m[1]));
    expect(ports).toHaveLength(4);
    expect(await tcpQuery(ports[0] as number, '*IDN?')).toBe('tunebench,SIM-SUPPLY,0,0.1');
    expect(await tcpQuery(ports[1] as number, '*IDN?')).toBe('tunebench,SIM-COUNTER,0,0.1');
    expect(await tcpQuery(ports[2] as number, '*IDN?')).toBe('tunebench,SIM-THERMOMETER,0,0.1');
    expect(await tcpQuery(ports[3] as number, '*IDN?')).toBe('tunebench,SIM-CHAMBER,0,0.1');
    expect(await tcpQuery(ports[3] as number, 'CONT?')).toBe('0');
    // Varactor DUT: oscillates at 0 V tuning once its supply is on (channel 2 is on at power-up).
    expect(Number(await tcpQuery(ports[1] as number, 'MEAS:FREQ?'))).toBeGreaterThan(200e6);
    controller.abort();
    await expect(running).resolves.toBe(0);
    expect(out()).toMatch(/radio-lo-vco-400m/);
  });

  it('rejects bad input with a UsageError naming the flag', async () => {
    const { io } = captureIo(AbortSignal.abort());
    await expect(simCommand.run(['--base-port', 'x'], io)).rejects.toThrow(UsageError);
    await expect(simCommand.run(['--base-port', '70000'], io)).rejects.toThrow(/--base-port/);
    await expect(simCommand.run(['--seed', '-1'], io)).rejects.toThrow(/--seed/);
    await expect(simCommand.run(['--dut', 'crystal'], io)).rejects.toThrow(/--dut "crystal"/);
    await expect(simCommand.run(['--no-signal', 'maybe'], io)).rejects.toThrow(/--no-signal/);
    await expect(simCommand.run(['--faults', '/nonexistent/f.json'], io)).rejects.toThrow(/--faults/);
    await expect(simCommand.run(['--colour', 'red'], io)).rejects.toThrow(/--colour/);
    const dir = await mkdtemp(join(tmpdir(), 'tunebench-sim-'));
    try {
      const dutFile = join(dir, 'dut.json');
      await writeFile(dutFile, JSON.stringify({ kind: 'varactor-lc', id: 'x' }));
      await expect(simCommand.run(['--dut', dutFile], io)).rejects.toThrow(/--dut:.*supply/);
      const faultFile = join(dir, 'faults.json');
      await writeFile(faultFile, JSON.stringify({ faults: [{ device: 'counter', type: 'delay', atS: 1 }] }));
      await expect(simCommand.run(['--faults', faultFile], io)).rejects.toThrow(/--faults:.*delayS/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

import { describe, expect, it } from 'vitest';
import { buildBenchConfig, DEFAULT_ROLE_DRAFTS } from './role-draft.ts';

describe('bench config from role choices', () => {
  it('builds the CONTRACTS.md address forms', () => {
    const { config, errors } = buildBenchConfig({
      supply: { ...DEFAULT_ROLE_DRAFTS.supply, mode: 'tcp', tcpAddress: '127.0.0.1:5025', profile: 'supply-scpi' },
      counter: { ...DEFAULT_ROLE_DRAFTS.counter, mode: 'serial', serialPath: '/dev/ttyUSB0', baud: '115200' },
      thermometer: { ...DEFAULT_ROLE_DRAFTS.thermometer, mode: 'none' },
    });
    expect(errors).toEqual({});
    expect(config?.supply).toMatchObject({
      address: 'tcp://127.0.0.1:5025',
      profile: 'supply-scpi',
      controlChannel: 1,
      dutSupplyChannel: 2,
    });
    expect(config?.counter).toEqual({ address: 'serial:/dev/ttyUSB0?baud=115200' });
    expect(config?.thermometer).toBeUndefined();
  });

  it('names the role and field that is wrong', () => {
    const { config, errors } = buildBenchConfig({
      ...DEFAULT_ROLE_DRAFTS,
      supply: { ...DEFAULT_ROLE_DRAFTS.supply, mode: 'tcp', tcpAddress: 'bench-psu' },
      counter: { ...DEFAULT_ROLE_DRAFTS.counter, mode: 'serial', serialPath: '' },
    });
    expect(config).toBeNull();
    expect(errors['supply.address']).toMatch(/HOST:PORT/);
    expect(errors['counter.address']).toBe('pick a serial port');
  });
});

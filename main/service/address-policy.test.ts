import { describe, expect, it } from 'vitest';
import { checkApiBench, isBenchIp, isSerialDevicePath, parseAllowedHosts } from './address-policy.ts';

const bench = (address: string, profile?: string) => ({
  supply: { address: 'sim', controlChannel: 1, dutSupplyChannel: 2 },
  counter: { address, ...(profile === undefined ? {} : { profile }) },
});
const strict = { extraHosts: new Set<string>(), resolve: async () => ['203.0.113.7'] };

describe('what a bench reached over the API may be (issue 14.3)', () => {
  it('knows loopback, private and link-local addresses (RFC 1918, RFC 4193, RFC 3927/4291) from the rest', () => {
    for (const ip of [
      '127.0.0.1',
      '127.8.9.1',
      '10.1.2.3',
      '172.16.0.1',
      '172.31.255.255',
      '192.168.1.20',
      '169.254.3.4',
      '::1',
      'fd12:3456::1',
      'fe80::1',
      '::ffff:192.168.0.9',
    ]) {
      expect(isBenchIp(ip), ip).toBe(true);
    }
    for (const ip of [
      '8.8.8.8',
      '172.32.0.1',
      '172.15.0.1',
      '192.169.0.1',
      '203.0.113.7',
      '2001:db8::1',
      '::ffff:8.8.8.8',
      '0.0.0.0',
    ]) {
      expect(isBenchIp(ip), ip).toBe(false);
    }
  });

  it('knows serial device paths from other files', () => {
    for (const path of [
      '/dev/ttyUSB0',
      '/dev/ttyACM1',
      '/dev/cu.usbserial-1410',
      '/dev/pts/7',
      '/dev/serial/by-id/usb-FTDI_FT232R-if00-port0',
      'COM3',
      '\\\\.\\COM12',
    ]) {
      expect(isSerialDevicePath(path), path).toBe(true);
    }
    for (const path of ['/etc/passwd', '/dev/sda', '/dev/../etc/passwd', '/home/u/x', '/dev/pts/../sda', 'COM'])
      expect(isSerialDevicePath(path), path).toBe(false);
  });

  it('refuses other hosts, names that resolve beyond the LAN, file paths as profiles and non-device serial paths, naming the field', async () => {
    await expect(checkApiBench(bench('tcp://8.8.8.8:5025'), strict)).rejects.toMatchObject({
      field: 'config.counter.address',
      message: expect.stringMatching(/8\.8\.8\.8 is not a loopback or private-LAN address.*--allow-address/),
    });
    await expect(checkApiBench(bench('tcp://instruments.example:5025'), strict)).rejects.toMatchObject({
      message: expect.stringContaining('resolves beyond loopback and private LANs'),
    });
    await expect(checkApiBench(bench('tcp://127.0.0.1:5025', '/etc/passwd'), strict)).rejects.toMatchObject({
      field: 'config.counter.profile',
    });
    await expect(checkApiBench(bench('tcp://127.0.0.1:5025', '../x'), strict)).rejects.toMatchObject({
      field: 'config.counter.profile',
    });
    await expect(checkApiBench(bench('serial:/etc/passwd'), strict)).rejects.toMatchObject({
      field: 'config.counter.address',
    });
  });

  it('accepts the bench a user has, and others only when the setting names them', async () => {
    await expect(checkApiBench(bench('tcp://192.168.7.20:5025', 'counter-scpi'), strict)).resolves.toBeUndefined();
    await expect(checkApiBench(bench('tcp://localhost:5025'), strict)).resolves.toBeUndefined();
    await expect(checkApiBench(bench('serial:/dev/ttyUSB0?baud=115200'), strict)).resolves.toBeUndefined();
    await expect(
      checkApiBench(bench('tcp://counter.lab:5025'), { extraHosts: new Set(), resolve: async () => ['10.0.0.9'] }),
    ).resolves.toBeUndefined();
    await expect(
      checkApiBench(bench('tcp://8.8.8.8:5025'), { extraHosts: parseAllowedHosts('8.8.8.8, other.example') }),
    ).resolves.toBeUndefined();
    await expect(
      checkApiBench(bench('tcp://203.0.113.9:5025'), { extraHosts: parseAllowedHosts('*') }),
    ).resolves.toBeUndefined();
    await expect(checkApiBench('sim', strict)).resolves.toBeUndefined();
  });
});

describe('the service applies the policy before opening anything', () => {
  it('refuses connect to a public address without ever calling openBench', async () => {
    const { createBenchService } = await import('./bench-service.ts');
    let opened = 0;
    const service = createBenchService({
      runsDir: '/nonexistent',
      openBench: async () => {
        opened += 1;
        throw new Error('must not be reached');
      },
      listSerialPorts: async () => [],
      listProfiles: async () => [],
      store: {} as never,
      procedures: {},
    });
    await expect(service.connect(bench('tcp://8.8.8.8:5025'))).rejects.toMatchObject({
      field: 'config.counter.address',
    });
    await expect(service.connect(bench('tcp://127.0.0.1:5025', '/etc/passwd'))).rejects.toMatchObject({
      field: 'config.counter.profile',
    });
    expect(opened).toBe(0);
  });
});

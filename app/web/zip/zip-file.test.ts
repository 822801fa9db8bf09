import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { crc32 } from './crc32.ts';
import { readZip, writeZip, ZipError } from './zip-file.ts';

const FIXTURES = fileURLToPath(new URL('../../../test/fixtures/zip/', import.meta.url));
const text = (bytes: Uint8Array): string => new TextDecoder().decode(bytes);

function hasPython(): boolean {
  try {
    execFileSync('python3', ['-c', 'import zipfile'], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}

describe('zip of run folders', () => {
  it('CRC-32 check value: "123456789" gives 0xCBF43926 (the standard check value of CRC-32/ISO-HDLC)', () => {
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
    expect(crc32(new Uint8Array(0))).toBe(0);
  });

  it('reads zips made by Python zipfile, stored and deflated, names and UTF-8 text intact', async () => {
    for (const name of ['python-stored.zip', 'python-deflated.zip']) {
      const entries = await readZip(new Uint8Array(readFileSync(join(FIXTURES, name))));
      expect(entries.map((e) => e.name)).toEqual([
        '20260101-120000-osc-7/run.json',
        '20260101-120000-osc-7/samples.csv',
        '20260101-120000-osc-7/events.jsonl',
      ]);
      expect(text(entries[1]?.bytes ?? new Uint8Array())).toBe(
        'index,control_v,frequency_hz\n0,0.5,1000.25\n1,1.0,2000.5\n',
      );
      expect(text(entries[2]?.bytes ?? new Uint8Array())).toContain('μ-range ✓');
    }
  });

  it('what it writes, its own reader and Python zipfile read back byte for byte', async () => {
    const files = [
      { name: 'run-a/samples.csv', bytes: new TextEncoder().encode('a,b\n1,2\n') },
      { name: 'run-a/events.jsonl', bytes: new TextEncoder().encode('{"type":"ünïcode"}\n') },
      { name: 'run-a/empty.txt', bytes: new Uint8Array(0) },
    ];
    const zip = writeZip(files, new Date(2026, 11, 2, 10, 30, 44));
    const back = await readZip(zip);
    expect(back.map((e) => [e.name, text(e.bytes)])).toEqual(files.map((f) => [f.name, text(f.bytes)]));
    if (!hasPython()) return;
    const dir = mkdtempSync(join(tmpdir(), 'tunebench-zip-'));
    try {
      writeFileSync(join(dir, 'a.zip'), zip);
      const listed = execFileSync(
        'python3',
        [
          '-c',
          'import sys,zipfile,json;z=zipfile.ZipFile(sys.argv[1]);assert z.testzip() is None;' +
            'print(json.dumps([[i.filename,z.read(i).decode(),i.date_time] for i in z.infolist()]))',
          join(dir, 'a.zip'),
        ],
        { encoding: 'utf8' },
      );
      expect(JSON.parse(listed)).toEqual(files.map((f) => [f.name, text(f.bytes), [2026, 12, 2, 10, 30, 44]]));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('refuses a damaged entry (CRC), a path that climbs out, and a file that is no zip', async () => {
    const zip = writeZip([{ name: 'r/x.csv', bytes: new TextEncoder().encode('1,2,3\n') }]);
    const bad = zip.slice();
    bad[30 + 7] = (bad[30 + 7] ?? 0) ^ 0xff;
    await expect(readZip(bad)).rejects.toThrow(/r\/x\.csv: CRC-32 does not match/);
    const climbing = writeZip([{ name: '../evil.csv', bytes: new Uint8Array([1]) }]);
    await expect(readZip(climbing)).rejects.toThrow(/outside the archive/);
    await expect(readZip(new TextEncoder().encode('not a zip at all, just text'))).rejects.toThrow(ZipError);
  });
});

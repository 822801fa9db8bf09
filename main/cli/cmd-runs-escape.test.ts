import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { dutIdSchema as apiDutId, noteTextSchema } from '../../app/contract/bench-api-schemas.ts';
import { createRun } from '../store/run-writer.ts';
import { dutIdSchema as storeDutId } from '../store/run-id.ts';
import { withTempDir } from '../store/testing/temp-dir.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runsCommand } from './cmd-runs.ts';

// U+202E (right-to-left override) reorders the rest of a terminal line; U+009B is the C1 control sequence introducer.
const RLO = '\u202e';
const CSI = '\u009b';

describe('control and bidi characters in DUT ids and notes (issue 14.7)', () => {
  it('are refused in DUT ids by the API and the store, and in notes (tab and line breaks stay allowed)', () => {
    for (const schema of [apiDutId, storeDutId]) {
      expect(schema.safeParse(`osc${RLO}gpj.exe`).success).toBe(false);
      expect(schema.safeParse(`osc${CSI}2J`).success).toBe(false);
      expect(schema.safeParse('osc-A rev2 µ').success).toBe(true);
    }
    expect(noteTextSchema.safeParse(`bench\n\tat 23 °C`).success).toBe(true);
    expect(noteTextSchema.safeParse(`bench ${RLO} hidden`).success).toBe(false);
  });

  it('are printed escaped by `tunebench runs` when a run.json written elsewhere holds them', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await createRun({
        runsDir,
        kind: 'sweep',
        dut: { id: 'plain' },
        instruments: [],
        plan: {},
        columns: ['time_s', 'control_v'],
        clock: new VirtualClock({ startWallIso: '2026-12-01T08:00:00.000Z' }),
      });
      await writer.finish('complete');
      const metaPath = join(runsDir, writer.id, 'run.json');
      const meta = JSON.parse(await readFile(metaPath, 'utf8')) as { dut: { id: string; notes: string } };
      await writeFile(
        metaPath,
        JSON.stringify({ ...meta, dut: { id: `osc${RLO}gpj.exe${CSI}2J`, notes: `note${RLO}` } }),
      );
      for (const argv of [
        ['--runs', runsDir],
        ['--runs', runsDir, '--json'],
      ]) {
        let stdout = '';
        const io = {
          stdout: { write: (text: string) => ((stdout += text), true) },
          stderr: { write: () => true },
          env: {},
        };
        expect(await runsCommand.run(argv, io)).toBe(0);
        expect(stdout).not.toMatch(/[\u0080-\u009f\u202a-\u202e]/);
        expect(stdout).toContain('\\u202e');
        if (argv.includes('--json'))
          expect((JSON.parse(stdout) as { dut: { notes: string } }[])[0]?.dut.notes).toBe(`note${RLO}`); // same JSON value
      }
    });
  });
});

/**
 * `tunebench check [--bench FILE]`: connect-only bring-up of a bench.
 */
import { bringUpBench, formatRoleCheck } from '../bench/bring-up.ts';
import { BenchCheckError } from '../bench/bench-checks.ts';
import { asUsageError } from './run-setup.ts';
import { loadBenchFile } from '../cli/config-files.ts';
import { RealClock } from '../time/real-clock.ts';
import { parseFlags } from './flags.ts';
import { UsageError, type CliCommand } from './types.ts';

const usage = `usage: tunebench check [--bench FILE]

Connects to every instrument of a bench and only asks questions: identity
(*IDN?), error queue, the supply's channel count and the state of its
control and DUT supply channels, one counter reading, one temperature.
Prints a PASS or FAIL line per role. Never turns an output on and never
changes a setting. Exit 0 only when every role answers.

options:
  --bench FILE    bench file (default: the built-in simulated bench)
`;

export const checkCommand: CliCommand = {
  name: 'check',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['bench'] });
    if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
    const benchPath = flags.values.get('bench');
    const config = benchPath === undefined ? 'sim' : await loadBenchFile(benchPath).catch(asUsageError);
    const results = await bringUpBench(config, { clock: new RealClock() }).catch((error: unknown) => {
      if (error instanceof BenchCheckError) asUsageError(error);
      throw error;
    });
    for (const check of results) io.stdout.write(`${formatRoleCheck(check)}\n`);
    const failed = results.filter((check) => !check.pass);
    io.stdout.write(
      failed.length === 0
        ? `check: all ${results.length} roles answer\n`
        : `check: ${failed.map((c) => c.role).join(', ')} failed\n`,
    );
    return failed.length === 0 ? 0 : 1;
  },
};

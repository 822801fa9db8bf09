/**
 * `tunebench runs [--runs DIR] [--json]`: the saved runs, newest first, one
 * line each (id, kind, status, DUT id, start time). A run whose writer died
 * shows as `interrupted` (and is recorded so by this very listing).
 */
import { sanitiseText, terminalSafeJson } from '../../app/contract/excerpt.ts';
import { homedir } from 'node:os';
import { join } from 'node:path';
import { listRunsDetailed } from '../store/run-store.ts';
import { resolveRunsDir } from '../store/runs-dir.ts';
import { parseFlags } from './flags.ts';
import { type CliCommand, type CliIo, UsageError } from './types.ts';

const usage = `usage: tunebench runs [--runs DIR] [--json]

Lists the saved runs, newest first: id, kind, status, DUT id, start time.

  --runs DIR   runs folder (default: $TUNEBENCH_RUNS, else the user data folder,
               e.g. ~/.local/share/tunebench/runs on Linux)
  --json       print the run.json of every run as a JSON array
`;

function table(rows: string[][]): string {
  const widths = rows[0]?.map((_, c) => Math.max(...rows.map((row) => (row[c] ?? '').length))) ?? [];
  return rows
    .map((row) => row.map((cell, c) => (c === row.length - 1 ? cell : cell.padEnd(widths[c] ?? 0))).join('  '))
    .join('\n');
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const flags = parseFlags(argv, { values: ['runs'], booleans: ['json'] });
  if (flags.positionals.length > 0) {
    throw new UsageError(`unexpected argument "${flags.positionals[0]}"; expected only --runs DIR and --json`);
  }
  const runsDir = resolveRunsDir(flags.values.get('runs'), io.env, process.platform, homedir());
  const { runs, problems, campaigns } = await listRunsDetailed(runsDir);
  for (const problem of problems)
    io.stderr.write(
      `tunebench runs: skipped ${sanitiseText(problem.name, 200)}: ${sanitiseText(problem.message, 400)}\n`,
    );
  for (const name of campaigns ?? [])
    io.stderr.write(
      `campaign folder: ${sanitiseText(name, 200)} (its runs: tunebench runs --runs ${sanitiseText(join(runsDir, name), 400)})\n`,
    );
  if (flags.booleans.has('json')) {
    // JSON.stringify leaves C1 controls and bidi overrides raw; as \uXXXX escapes the JSON means the same and the terminal stays intact.
    io.stdout.write(`${terminalSafeJson(JSON.stringify(runs, null, 2))}\n`);
    return 0;
  }
  if (runs.length === 0) {
    io.stderr.write(`no runs in ${runsDir}\n`);
    return 0;
  }
  // Ids and notes written by older versions or by hand may hold control or bidi characters: shown escaped.
  const rows = runs.map((meta) =>
    [meta.id, meta.kind, meta.status, meta.dut.id, meta.startedAt].map((cell) => sanitiseText(cell, 200)),
  );
  // No header row: CONTRACTS.md promises exactly one line per run.
  io.stdout.write(`${table(rows)}\n`);
  return 0;
}

export const runsCommand: CliCommand = {
  name: 'runs',
  usage,
  run,
};

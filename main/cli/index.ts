/**
 * `tunebench` entry point: dispatches to a sub-command and maps errors to
 * exit codes (0 done, 1 work failed, 2 bad input). A user error never prints
 * a stack trace.
 */
import { commands } from './commands.ts';
import { argsBeforeSeparator } from './flags.ts';
import { watchParent } from './parent-watch.ts';
import { UsageError, WorkFailedError, type CliIo } from './types.ts';
import { tuneForBigWork } from './v8-tuning.ts';

function mainHelp(): string {
  const width = Math.max(...commands.map((c) => c.name.length), 4);
  const lines = commands.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`);
  return [
    'tunebench — characterise voltage-controlled oscillators on a lab bench',
    '',
    'usage: tunebench <command> [options]',
    '',
    'commands:',
    ...lines,
    '',
    'Run `tunebench <command> --help` for the options of one command.',
    'With no --bench file, commands run against the built-in simulated bench.',
    'Every key of the bench, plan, profile and DUT files: resources/docs/reference.md (and `tunebench schema NAME`).',
    '',
  ].join('\n');
}

export async function runCli(argv: string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    io.stdout.write(mainHelp());
    return name === undefined ? 2 : 0;
  }
  if (name === '--version') {
    io.stdout.write('tunebench 0.1.0\n');
    return 0;
  }
  const entry = commands.find((c) => c.name === name);
  if (!entry) {
    io.stderr.write(`tunebench: unknown command "${name}"\n\n${mainHelp()}`);
    return 2;
  }
  const command = await entry.load();
  const beforeSeparator = argsBeforeSeparator(rest);
  if (beforeSeparator.includes('--help') || beforeSeparator.includes('-h')) {
    io.stdout.write(`${command.usage.trimEnd()}\n`);
    return 0;
  }
  // Owning the process (the installed bin or npx): stop as on SIGTERM when the parent goes
  // away, so an orphaned `sim` or drift log releases its ports and leaves the bench safe.
  if (!entry.quickStart) tuneForBigWork();
  const unwatch = io.stdout === process.stdout ? watchParent(() => process.kill(process.pid, 'SIGTERM')) : () => {};
  try {
    return await command.run(rest, io);
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr.write(`tunebench ${name}: ${error.message}\n`);
      return 2;
    }
    if (error instanceof WorkFailedError) {
      io.stderr.write(`tunebench ${name}: ${error.message}\n`);
      return 1;
    }
    const message = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
    io.stderr.write(`tunebench ${name}: failed: ${message}\n`);
    if (io.env.TUNEBENCH_DEBUG && error instanceof Error && error.stack) io.stderr.write(`${error.stack}\n`);
    return 1;
  } finally {
    unwatch();
  }
}

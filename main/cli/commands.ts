/**
 * Registry of sub-commands, in the order `tunebench --help` lists them:
 * the bench procedures first, then analysis, then the tools around them.
 *
 * Each command's module loads only when that command runs (or prints its
 * help), so `tunebench analyze` never evaluates the instrument layer, the
 * simulator, the procedures or the browser server, and `--help` evaluates
 * none of them. In the prebuilt bundle esbuild turns each `import()` below
 * into a lazily initialised part of the one file.
 */
import type { CliCommand } from './types.ts';

export interface CommandEntry {
  name: string;
  /** One line for `tunebench --help`. */
  summary: string;
  load(): Promise<CliCommand>;
  /**
   * Runs with V8 set for a short command, as the launcher starts it (see v8-tuning.ts): a command
   * people wait on with small input, which tunes V8 for big work itself when the input is big.
   * Every other command gets V8's own settings before it runs.
   */
  quickStart?: true;
}

export const commands: CommandEntry[] = [
  {
    name: 'sweep',
    summary: 'gain sweep of the DUT into a new run folder',
    load: async () => (await import('./cmd-sweep.ts')).sweepCommand,
  },
  {
    name: 'drift',
    summary: 'drift log at a fixed control voltage (frequency + temperature)',
    load: async () => (await import('./cmd-drift.ts')).driftCommand,
  },
  {
    name: 'pushing',
    summary: 'supply pushing (Hz/V) at a fixed control voltage',
    load: async () => (await import('./cmd-pushing.ts')).pushingCommand,
  },
  {
    name: 'campaign',
    summary: 'characterisation over temperature (chamber), supply corners and units',
    load: async () => (await import('./cmd-campaign.ts')).campaignCommand,
  },
  {
    name: 'analyze',
    summary: 'analyse a sweep, drift or pushing run (or a plain CSV)',
    load: async () => (await import('./cmd-analyze.ts')).analyzeCommand,
    quickStart: true,
  },
  {
    name: 'datasheet',
    summary: 'gain table over one or more runs (Markdown, CSV or HTML)',
    load: async () => (await import('./cmd-datasheet.ts')).datasheetCommand,
  },
  {
    name: 'runs',
    summary: 'list saved runs: id, kind, status, DUT id, start time',
    load: async () => (await import('./cmd-runs.ts')).runsCommand,
  },
  {
    name: 'check',
    summary: 'connect-only bring-up of a bench: a pass/fail line per instrument',
    load: async () => (await import('./cmd-check.ts')).checkCommand,
  },
  {
    name: 'schema',
    summary: 'print the JSON Schema of a bench, plan, profile or DUT file',
    load: async () => (await import('./cmd-schema.ts')).schemaCommand,
  },
  {
    name: 'sim',
    summary: 'serve the simulated bench (supply, counter, thermometer, chamber) on TCP ports',
    load: async () => (await import('./cmd-sim.ts')).simCommand,
  },
  {
    name: 'serve',
    summary: 'browser mode: serve the app on 127.0.0.1 with an access token',
    load: async () => (await import('./cmd-serve.ts')).serveCommand,
  },
  {
    name: 'demo',
    summary: 'simulated sweep of a built-in DUT and its gain table (seconds, no instruments)',
    load: async () => (await import('./cmd-demo.ts')).demoCommand,
  },
];

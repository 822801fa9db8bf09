/**
 * Registry of sub-commands, in the order `tunebench --help` lists them:
 * the bench procedures first, then analysis, then the tools around them.
 */
import { analyzeCommand } from './cmd-analyze.ts';
import { campaignCommand } from './cmd-campaign.ts';
import { checkCommand } from './cmd-check.ts';
import { datasheetCommand } from './cmd-datasheet.ts';
import { demoCommand } from './cmd-demo.ts';
import { driftCommand } from './cmd-drift.ts';
import { pushingCommand } from './cmd-pushing.ts';
import { runsCommand } from './cmd-runs.ts';
import { schemaCommand } from './cmd-schema.ts';
import { serveCommand } from './cmd-serve.ts';
import { simCommand } from './cmd-sim.ts';
import { sweepCommand } from './cmd-sweep.ts';
import type { CliCommand } from './types.ts';

export const commands: CliCommand[] = [
  sweepCommand,
  driftCommand,
  pushingCommand,
  campaignCommand,
  analyzeCommand,
  datasheetCommand,
  runsCommand,
  checkCommand,
  schemaCommand,
  simCommand,
  serveCommand,
  demoCommand,
];

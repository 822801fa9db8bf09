/**
 * Registry of sub-commands. Each contributor adds its command here.
 */
import { runsCommand } from './cmd-runs.ts';
import { analyzeCommand } from './cmd-analyze.ts';
import { datasheetCommand } from './cmd-datasheet.ts';
import type { CliCommand } from './types.ts';
import { sweepCommand } from './cmd-sweep.ts';
import { driftCommand } from './cmd-drift.ts';
import { pushingCommand } from './cmd-pushing.ts';
import { demoCommand } from './cmd-demo.ts';
import { serveCommand } from './cmd-serve.ts';
import { simCommand } from './cmd-sim.ts';

export const commands: CliCommand[] = [serveCommand, analyzeCommand, runsCommand, datasheetCommand, simCommand, sweepCommand, driftCommand, pushingCommand, demoCommand];

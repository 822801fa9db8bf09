/**
 * `npm run bench`: every speed figure the issues ask for, measured in one
 * run on this machine and printed. Each suite prints its own table; this
 * file only runs them in turn. Pass suite names to run a subset:
 *   npm run bench -- analysis procedures
 */
import { runScpiThroughputBench } from './scpi-throughput.ts';
import { runAnalysisBench } from './analysis.ts';
import { runBigInputsBench } from './big-inputs.ts';
import { runProceduresBench } from './procedures.ts';
import { runBrowserBench } from './browser.ts';
import { runBigRunsBench } from './big-runs.ts';
import { benchStoreAppend } from './store-append.ts';
import { runSimClockBench } from './sim-clock.ts';
import { runCliStartBench } from './cli-start.ts';
import { runSweepFloorBench } from './sweep-floor.ts';
import { runAdaptiveReadingsBench } from './adaptive-readings.ts';

const suites: Record<string, () => Promise<unknown>> = {
  'cli-start': () => runCliStartBench(),
  scpi: runScpiThroughputBench,
  analysis: async () => runAnalysisBench(),
  'big-inputs': runBigInputsBench,
  procedures: runProceduresBench,
  'sweep-floor': runSweepFloorBench,
  'adaptive-readings': runAdaptiveReadingsBench,
  store: async () => {
    for (const line of await benchStoreAppend()) console.log(line);
  },
  'sim-clock': runSimClockBench,
  browser: runBrowserBench,
  'big-runs': () => runBigRunsBench(),
};

const wanted = process.argv.slice(2);
const names = wanted.length > 0 ? wanted : Object.keys(suites);
let failed = 0;
for (const name of names) {
  const suite = suites[name];
  if (!suite) {
    console.error(`unknown bench suite "${name}"; known: ${Object.keys(suites).join(', ')}`);
    process.exitCode = 2;
    continue;
  }
  console.log(`\n=== ${name} ===`);
  try {
    await suite();
  } catch (error) {
    failed++;
    console.error(`bench ${name} failed: ${error instanceof Error ? error.message : String(error)}`);
  }
}
if (failed > 0) process.exitCode = 1;

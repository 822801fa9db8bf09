/**
 * Reading bench and plan files for the command line: JSON parsed, checked
 * with the contract schemas, and every problem reported as one line per
 * field with the expected form (exit code 2 at the CLI).
 */
import { readFile } from 'node:fs/promises';
import type { z } from 'zod';
import { JsonShapeError, parseBoundedJson } from '../../app/contract/bounded-json.ts';
import { parseAddress } from '../instruments/address.ts';
import { AddressError } from '../instruments/errors.ts';
import { benchChannelProblems } from '../bench/bench-checks.ts';
import {
  benchConfigSchema,
  describeIssues,
  driftPlanSchema,
  pushingPlanSchema,
  sweepPlanSchema,
  type BenchConfig,
  type DriftPlan,
  type PushingPlan,
  type SweepPlan,
} from '../../app/contract/plans.ts';
import { campaignPlanSchema, type CampaignPlan } from '../../app/contract/campaign-plan.ts';

/** A bench or plan file that cannot be used; the message names the file and the field. */
export class ConfigFileError extends Error {
  override readonly name = 'ConfigFileError';
}

async function readJson(path: string, what: string): Promise<unknown> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    throw new ConfigFileError(
      `${what} ${path}: cannot read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`,
    );
  }
  try {
    return parseBoundedJson(text);
  } catch (error) {
    if (error instanceof JsonShapeError) throw new ConfigFileError(`${what} ${path}: ${error.message}`);
    throw error;
  }
}

export function parseWith<S extends z.ZodType>(schema: S, value: unknown, label: string): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) {
    const lines = describeIssues(result.error)
      .split('\n')
      .map((line) => `  ${line}`);
    throw new ConfigFileError(`${label} is not valid:\n${lines.join('\n')}`);
  }
  return result.data;
}

export async function loadBenchFile(path: string): Promise<BenchConfig> {
  const bench = parseWith(benchConfigSchema, await readJson(path, 'bench file'), `bench file ${path}`);
  // Addresses are checked here, not at connect time, so the message names
  // the role's field (`counter.address`) before any instrument is touched.
  const problems: string[] = [];
  for (const role of ['supply', 'counter', 'thermometer'] as const) {
    const address = bench[role]?.address;
    if (address === undefined) continue;
    try {
      parseAddress(address);
    } catch (error) {
      if (!(error instanceof AddressError)) throw error;
      problems.push(`  ${role}.address: ${error.message.replace(/^address [^:]*: /, '')}`);
    }
  }
  // The same channel for tuning port and DUT supply is refused here, before any instrument is opened.
  problems.push(...benchChannelProblems(bench).map((line) => `  ${line}`));
  if (problems.length > 0) throw new ConfigFileError(`bench file ${path} is not valid:\n${problems.join('\n')}`);
  return bench;
}

export async function loadSweepPlan(path: string): Promise<SweepPlan> {
  return parseWith(sweepPlanSchema, await readJson(path, 'plan file'), `sweep plan ${path}`);
}

export async function loadDriftPlan(path: string): Promise<DriftPlan> {
  return parseWith(driftPlanSchema, await readJson(path, 'plan file'), `drift plan ${path}`);
}

export async function loadPushingPlan(path: string): Promise<PushingPlan> {
  return parseWith(pushingPlanSchema, await readJson(path, 'plan file'), `pushing plan ${path}`);
}

/** A campaign plan: the checked plan, and the file's JSON as written (campaign.json keeps it so). */
export async function loadCampaignPlan(path: string): Promise<{ input: unknown; plan: CampaignPlan }> {
  const input = await readJson(path, 'plan file');
  return { input, plan: parseWith(campaignPlanSchema, input, `campaign plan ${path}`) };
}

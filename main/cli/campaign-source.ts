/**
 * Loads a campaign folder for `analyze` and `datasheet`: campaign.json, and
 * for each condition with a run, that run's sweep analysed as `analyze`
 * would; then the campaign analysis over all of them.
 */
import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import {
  analyzeCampaign,
  type CampaignAnalysis,
  type CampaignConditionInput,
} from '../../app/analysis/campaign-analysis.ts';
import { analyzeTable } from '../../app/analysis/analyze-table.ts';
import { runOrigin } from '../../app/analysis/datasheet-run.ts';
import type { SweepAnalysis } from '../../app/analysis/sweep-types.ts';
import {
  campaignPlanSchema,
  nominalControlOf,
  nominalSupplyOf,
  sweepRangeV,
} from '../../app/contract/campaign-plan.ts';
import { CAMPAIGN_FILE, readCampaignFile, type CampaignFile } from '../procedures/campaign/campaign-file.ts';
import { loadAnalysisSource } from './analysis-source.ts';
import { UsageError } from './types.ts';

export async function isCampaignDir(path: string): Promise<boolean> {
  const info = await stat(join(path, CAMPAIGN_FILE)).catch(() => null);
  return info?.isFile() ?? false;
}

export async function loadCampaignAnalysis(dir: string): Promise<{ file: CampaignFile; analysis: CampaignAnalysis }> {
  const file = await readCampaignFile(dir).catch((error: Error) => {
    throw new UsageError(error.message);
  });
  const parsed = campaignPlanSchema.safeParse(file.plan);
  if (!parsed.success)
    throw new UsageError(`${join(dir, CAMPAIGN_FILE)}: plan: ${parsed.error.issues[0]?.message ?? 'invalid'}`);
  const plan = parsed.data;
  const inputs: CampaignConditionInput[] = [];
  for (const entry of file.conditions) {
    let sweep: SweepAnalysis | null = null;
    let simulated = false;
    if (entry.runId !== null && entry.state === 'done') {
      const source = await loadAnalysisSource(join(dir, entry.runId));
      simulated = source.meta !== null && runOrigin(source.meta).simulated;
      const result = analyzeTable('sweep', source.table, { gateS: source.gateS });
      if (result.kind === 'sweep') sweep = result;
    }
    const t = entry.dutTemperatureC;
    const dutC = t && t.start !== null && t.end !== null ? (t.start + t.end) / 2 : (t?.start ?? t?.end ?? null);
    inputs.push({
      index: entry.index,
      unit: entry.unit,
      temperatureC: entry.temperatureC,
      dutTemperatureC: dutC,
      supplyV: entry.supplyV,
      runId: entry.runId,
      status: entry.state,
      points: sweep ? sweep.points : null,
      stallV: sweep?.stall.thresholdV ?? null,
      stallUncertaintyV: sweep?.stall.thresholdUncertaintyV ?? null,
      simulated,
    });
  }
  const analysis = analyzeCampaign(inputs, {
    nominalControlV: nominalControlOf(plan),
    nominalSupplyV: nominalSupplyOf(plan),
    tuningWindowV: plan.tuningWindowV ?? sweepRangeV(plan.sweep),
    headroomTargetHz: plan.headroomTargetHz,
  });
  return { file, analysis };
}

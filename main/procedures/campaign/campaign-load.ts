/**
 * Reads a campaign folder for its analysis: campaign.json, and for each
 * finished condition its sweep run analysed as `tunebench analyze` would
 * (the store's reader, the one analysis); then the campaign analysis over
 * all of them. Shared by the CLI (analyze, datasheet) and the service (the
 * app's campaign datasheet).
 */
import { joinPath as join } from '../../store/store-path.ts';
import {
  analyzeCampaign,
  type CampaignAnalysis,
  type CampaignConditionInput,
} from '../../../app/analysis/campaign-analysis.ts';
import { AnalysisError } from '../../../app/analysis/analysis-error.ts';
import { analyzeTable } from '../../../app/analysis/analyze-table.ts';
import { runHints, runOrigin } from '../../../app/analysis/datasheet-run.ts';
import {
  campaignPlanSchema,
  nominalControlOf,
  nominalSupplyOf,
  sweepRangeV,
} from '../../../app/contract/campaign-plan.ts';
import { describeIssues } from '../../../app/contract/schema-kit.ts';
import { readRunFolder } from '../../store/run-reader.ts';
import { readSampleTable } from '../../store/sample-table.ts';
import { CAMPAIGN_FILE, CampaignFileError, readCampaignFile, type CampaignFile } from './campaign-file.ts';

export async function loadCampaign(dir: string): Promise<{ file: CampaignFile; analysis: CampaignAnalysis }> {
  const file = await readCampaignFile(dir);
  const parsed = campaignPlanSchema.safeParse(file.plan);
  if (!parsed.success)
    throw new CampaignFileError(`${join(dir, CAMPAIGN_FILE)}: plan: ${describeIssues(parsed.error)}`);
  const plan = parsed.data;
  const inputs: CampaignConditionInput[] = [];
  for (const entry of file.conditions) {
    const input: CampaignConditionInput = {
      index: entry.index,
      unit: entry.unit,
      temperatureC: entry.temperatureC,
      dutTemperatureC: meanOfSpan(entry.dutTemperatureC),
      supplyV: entry.supplyV,
      runId: entry.runId,
      status: entry.state,
      points: null,
      stallV: null,
    };
    if (entry.runId !== null && entry.state === 'done') {
      const run = await readRunFolder(join(dir, entry.runId)).catch((error: Error) => {
        throw new CampaignFileError(`${join(dir, entry.runId ?? '')}: not a readable run folder (${error.message})`);
      });
      let result: ReturnType<typeof analyzeTable> | null = null;
      try {
        result = analyzeTable('sweep', readSampleTable(run.samplesCsv), { gateS: runHints(run.meta).gateS });
      } catch (error) {
        // A sweep that cannot be analysed gives this condition no figures; the others still count.
        if (!(error instanceof AnalysisError)) throw error;
        input.status = `done (not analysable: ${error.message})`;
      }
      if (result?.kind === 'sweep') {
        input.points = result.points;
        input.stallV = result.stall.thresholdV;
        input.stallUncertaintyV = result.stall.thresholdUncertaintyV;
      }
      input.simulated = runOrigin(run.meta).simulated;
    }
    inputs.push(input);
  }
  const analysis = analyzeCampaign(inputs, {
    nominalControlV: nominalControlOf(plan),
    nominalSupplyV: nominalSupplyOf(plan),
    tuningWindowV: plan.tuningWindowV ?? sweepRangeV(plan.sweep),
    headroomTargetHz: plan.headroomTargetHz,
  });
  return { file, analysis };
}

/** Mean of the DUT temperature at a sweep's start and end (either alone when the other was unread). */
function meanOfSpan(t: { start: number | null; end: number | null } | null): number | null {
  if (t === null) return null;
  if (t.start !== null && t.end !== null) return (t.start + t.end) / 2;
  return t.start ?? t.end;
}

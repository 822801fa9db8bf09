/**
 * `analyze` and `datasheet` given a campaign folder: the procedures' loader
 * (main/procedures/campaign/campaign-load.ts), its refusals as usage errors.
 */
import type { CampaignAnalysis } from '../../app/analysis/campaign-analysis.ts';
import { CampaignFileError, type CampaignFile } from '../procedures/campaign/campaign-file.ts';
import { loadCampaign } from '../procedures/campaign/campaign-load.ts';
import { UsageError } from './types.ts';

export { isCampaignDir } from './campaign-dir.ts';

export async function loadCampaignAnalysis(dir: string): Promise<{ file: CampaignFile; analysis: CampaignAnalysis }> {
  try {
    return await loadCampaign(dir);
  } catch (error) {
    if (error instanceof CampaignFileError) throw new UsageError(error.message);
    throw error;
  }
}

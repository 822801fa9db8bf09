/**
 * Whether a folder is a campaign's (holds campaign.json). Its own module so
 * `analyze` and `datasheet` of an ordinary run or CSV load none of the
 * campaign analysis to find out.
 */
import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import { CAMPAIGN_FILE } from '../procedures/campaign/campaign-file.ts';

export async function isCampaignDir(path: string): Promise<boolean> {
  const info = await stat(join(path, CAMPAIGN_FILE)).catch(() => null);
  return info?.isFile() ?? false;
}

/**
 * Whether a folder is a campaign's (holds campaign.json). Its own module so
 * `analyze` and `datasheet` of an ordinary run or CSV load none of the
 * campaign analysis to find out; a path that is not a folder (a CSV) does
 * not even load the campaign file's module (its schemas).
 */
import { stat } from 'node:fs/promises';
import { join } from 'node:path';

export async function isCampaignDir(path: string): Promise<boolean> {
  const folder = await stat(path).catch(() => null);
  if (!folder?.isDirectory()) return false;
  const { CAMPAIGN_FILE } = await import('../procedures/campaign/campaign-file.ts');
  const info = await stat(join(path, CAMPAIGN_FILE)).catch(() => null);
  return info?.isFile() ?? false;
}

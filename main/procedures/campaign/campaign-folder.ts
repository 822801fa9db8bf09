/**
 * The campaign folder: `<runs>/<YYYYMMDD-HHMMSS>-campaign-<slug>/` holding
 * campaign.json, campaign-events.jsonl and one ordinary run folder per sweep.
 */
import { appendFile, mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { dutSlug } from '../../store/run-id.ts';

export const CAMPAIGN_EVENTS_FILE = 'campaign-events.jsonl';

export async function createCampaignFolder(runsDir: string, wallIso: string, label: string): Promise<{ id: string; dir: string }> {
  const stamp = wallIso.slice(0, 19).replace(/[-:]/g, '').replace('T', '-');
  const base = `${stamp}-campaign-${dutSlug(label)}`;
  await mkdir(runsDir, { recursive: true });
  for (let n = 1; n < 1000; n++) {
    const id = n === 1 ? base : `${base}-${n}`;
    const dir = join(runsDir, id);
    try {
      await mkdir(dir);
      return { id, dir };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
    }
  }
  throw new Error(`${runsDir}: no free campaign folder name for ${base}`);
}

/** Appends one event line; the campaign's own log beside its runs. */
export async function appendCampaignEvent(dir: string, event: Record<string, unknown>): Promise<void> {
  await appendFile(join(dir, CAMPAIGN_EVENTS_FILE), `${JSON.stringify(event)}\n`, 'utf8');
}

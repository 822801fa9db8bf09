/**
 * campaign.json: the plan, the campaign's status and one entry per condition
 * with its run id and state, in the campaign folder beside the ordinary run
 * folders. Replaced atomically on every change (main/store/atomic-json.ts),
 * so a crash leaves the previous or the next version whole; a process that
 * dies leaves `running`, which a resume reads as interrupted.
 */
import { z } from 'zod';
import { writeJsonAtomic } from '../../store/atomic-json.ts';
import { joinPath as join } from '../../store/store-path.ts';
import { nodeStoreFs } from '../../store/store-fs.ts';

export const CAMPAIGN_SCHEMA = 'tunebench.campaign/1';
export const CAMPAIGN_FILE = 'campaign.json';

export const conditionStateSchema = z.enum(['waiting', 'soaking', 'sweeping', 'done', 'failed', 'skipped']);
export type ConditionState = z.infer<typeof conditionStateSchema>;

const nullableNumber = z.number().nullable();

export const campaignEntrySchema = z.looseObject({
  index: z.number().int().nonnegative(),
  unit: z.string(),
  temperatureC: z.number(),
  supplyV: z.number(),
  state: conditionStateSchema,
  /** The run folder (in this campaign folder) of the sweep that counts. */
  runId: z.string().nullable(),
  /** Runs started for this condition and abandoned (interrupted, failed), oldest first. */
  earlierRunIds: z.array(z.string()).default([]),
  soak: z
    .looseObject({
      result: z.enum(['soaked', 'timeout']),
      waitedS: z.number(),
      dutC: nullableNumber,
      airC: nullableNumber,
    })
    .nullable()
    .default(null),
  /** DUT temperature at the start and end of the sweep (the run's own conditions). */
  dutTemperatureC: z.object({ start: nullableNumber, end: nullableNumber }).nullable().default(null),
  message: z.string().nullable().default(null),
});
export type CampaignEntry = z.infer<typeof campaignEntrySchema>;

export const campaignStatusSchema = z.enum(['running', 'complete', 'aborted', 'failed', 'interrupted']);
export type CampaignStatus = z.infer<typeof campaignStatusSchema>;

export const campaignFileSchema = z.looseObject({
  schema: z.literal(CAMPAIGN_SCHEMA),
  id: z.string(),
  createdAt: z.string(),
  updatedAt: z.string(),
  status: campaignStatusSchema,
  /** Why it ended, when it ended early. */
  reason: z.string().nullable().default(null),
  /** The plan as given (validated again on resume). */
  plan: z.unknown(),
  conditions: z.array(campaignEntrySchema),
});
export type CampaignFile = z.infer<typeof campaignFileSchema>;

export class CampaignFileError extends Error {
  override name = 'CampaignFileError';
}

export async function readCampaignFile(dir: string): Promise<CampaignFile> {
  const path = join(dir, CAMPAIGN_FILE);
  let text: string;
  try {
    text = await nodeStoreFs.readFile(path);
  } catch (error) {
    throw new CampaignFileError(`${path}: cannot read (${(error as Error).message}); is ${dir} a campaign folder?`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new CampaignFileError(`${path}: not valid JSON (${(error as Error).message})`);
  }
  const parsed = campaignFileSchema.safeParse(json);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    throw new CampaignFileError(
      `${path}: ${first ? `${first.path.join('.') || '(root)'}: ${first.message}` : 'invalid'}`,
    );
  }
  return parsed.data;
}

export function writeCampaignFile(dir: string, file: CampaignFile): Promise<void> {
  return writeJsonAtomic(nodeStoreFs, join(dir, CAMPAIGN_FILE), file);
}

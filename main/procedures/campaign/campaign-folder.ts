/**
 * The campaign folder: `<runs>/<YYYYMMDD-HHMMSS>-campaign-<slug>/` holding
 * campaign.json, campaign-events.jsonl, soak-log.csv and one ordinary run
 * folder per sweep.
 */
import { joinPath as join, resolvePath as resolve } from '../../store/store-path.ts';
import {
  makeLock,
  readLock,
  registerOpenWriter,
  removeLock,
  unregisterOpenWriter,
  writeLock,
  writerAlive,
} from '../../store/writer-lock.ts';
import { nodeStoreFs } from '../../store/store-fs.ts';
import { dutSlug } from '../../store/run-id.ts';

export const CAMPAIGN_EVENTS_FILE = 'campaign-events.jsonl';
/** Every soak reading: condition index, campaign time, setpoint, air, DUT, frequency (empty when not read). */
export const SOAK_LOG_FILE = 'soak-log.csv';
export const SOAK_LOG_HEADER = 'index,time_s,setpoint_c,air_c,dut_c,frequency_hz';

export async function createCampaignFolder(
  runsDir: string,
  wallIso: string,
  label: string,
): Promise<{ id: string; dir: string }> {
  const stamp = wallIso.slice(0, 19).replace(/[-:]/g, '').replace('T', '-');
  const base = `${stamp}-campaign-${dutSlug(label)}`;
  await nodeStoreFs.mkdir(runsDir, { recursive: true });
  for (let n = 1; n < 1000; n++) {
    const id = n === 1 ? base : `${base}-${n}`;
    const dir = join(runsDir, id);
    try {
      await nodeStoreFs.mkdir(dir);
      return { id, dir };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
    }
  }
  throw new Error(`${runsDir}: no free campaign folder name for ${base}`);
}

/** Appends one event line; the campaign's own log beside its runs. */
export async function appendCampaignEvent(dir: string, event: Record<string, unknown>): Promise<void> {
  await nodeStoreFs.appendFile(join(dir, CAMPAIGN_EVENTS_FILE), `${JSON.stringify(event)}\n`);
}

/** Writes the soak log's header unless the file exists (a resumed campaign carries on in it). */
export async function ensureSoakLog(dir: string): Promise<void> {
  try {
    await nodeStoreFs.writeFile(join(dir, SOAK_LOG_FILE), `${SOAK_LOG_HEADER}\n`, { flag: 'wx' });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
  }
}

/** Appends one soak reading; numbers in shortest round-trip form, empty for none. */
export function appendSoakRow(dir: string, row: readonly (number | null)[]): Promise<void> {
  const cells = row.map((v) => (v === null || !Number.isFinite(v) ? '' : String(v))).join(',');
  return nodeStoreFs.appendFile(join(dir, SOAK_LOG_FILE), `${cells}\n`);
}

/**
 * Claims the campaign folder for this process with the store's writer lock
 * (pid, host, heartbeat), so a second process cannot resume a campaign that
 * is still running. Refuses when a live writer holds it. Returns the
 * heartbeat (call on each save) and the release.
 */
export async function claimCampaignFolder(
  dir: string,
  startedAtIso: string,
): Promise<{ beat: () => Promise<void>; release: () => Promise<void> }> {
  const abs = resolve(dir);
  const held = await readLock(nodeStoreFs, abs);
  if (writerAlive(held, abs)) {
    throw new CampaignBusyError(
      `${dir}: the campaign is still running (pid ${held?.pid ?? '?'} on ${held?.host ?? '?'}); stop it before resuming`,
    );
  }
  const write = (): Promise<void> => writeLock(nodeStoreFs, abs, makeLock(startedAtIso, Date.now()));
  await write();
  registerOpenWriter(abs);
  return {
    beat: write,
    async release() {
      unregisterOpenWriter(abs);
      await removeLock(nodeStoreFs, abs);
    },
  };
}

export class CampaignBusyError extends Error {
  override name = 'CampaignBusyError';
}

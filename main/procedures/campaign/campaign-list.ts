/**
 * The campaign folders of a runs folder, newest first, each with its status
 * as a reader should see it: a `running` campaign whose writer is gone
 * (pid, host, heartbeat of the store's writer lock) is `interrupted`.
 */
import { joinPath as join, resolvePath as resolve } from '../../store/store-path.ts';
import { readLock, writerAlive } from '../../store/writer-lock.ts';
import { nodeStoreFs } from '../../store/store-fs.ts';
import { readCampaignFile, type CampaignFile, type CampaignStatus } from './campaign-file.ts';

export interface CampaignFolderSummary {
  id: string;
  status: CampaignStatus;
  createdAt: string;
  units: string[];
  conditions: number;
  done: number;
}

/** `running` in campaign.json, but nobody is writing it: the process died. */
export async function effectiveStatus(dir: string, file: CampaignFile): Promise<CampaignStatus> {
  if (file.status !== 'running') return file.status;
  const abs = resolve(dir);
  const held = await readLock(nodeStoreFs, abs).catch(() => null);
  return writerAlive(held, abs) ? 'running' : 'interrupted';
}

export async function listCampaignFolders(runsDir: string): Promise<CampaignFolderSummary[]> {
  const names = await nodeStoreFs.readdir(runsDir).catch(() => [] as string[]);
  const found: CampaignFolderSummary[] = [];
  for (const name of names
    .filter((n) => n.includes('-campaign-'))
    .sort()
    .reverse()) {
    const dir = join(runsDir, name);
    const file = await readCampaignFile(dir).catch(() => null);
    if (file === null) continue;
    found.push({
      id: name,
      status: await effectiveStatus(dir, file),
      createdAt: file.createdAt,
      units: [...new Set(file.conditions.map((c) => c.unit))],
      conditions: file.conditions.length,
      done: file.conditions.filter((c) => c.state === 'done').length,
    });
  }
  return found;
}

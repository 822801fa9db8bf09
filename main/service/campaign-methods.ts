/**
 * The BenchApi's campaign methods: start or resume a campaign on the
 * connected bench (which needs its chamber and DUT thermometer), stop it,
 * answer the unit change, read its state, list campaign folders and build a
 * campaign's datasheet. The bench service lends the bench (`acquire`) and
 * takes it back when the campaign ends (`release`).
 */
import { join } from 'node:path';
import {
  campaignConditionsText,
  campaignSheetRows,
  headroomCells,
  renderCampaignMarkdown,
} from '../../app/analysis/campaign-datasheet.ts';
import { formatFigure } from '../../app/analysis/format-figure.ts';
import type { CampaignSheet, CampaignView } from '../../app/contract/campaign-schemas.ts';
import { CampaignBusyError } from '../procedures/campaign/campaign-folder.ts';
import { CampaignFileError, readCampaignFile } from '../procedures/campaign/campaign-file.ts';
import { effectiveStatus, listCampaignFolders } from '../procedures/campaign/campaign-list.ts';
import { loadCampaign } from '../procedures/campaign/campaign-load.ts';
import { LimitsError } from '../procedures/limits.ts';
import { startCampaignSession, type CampaignSession } from './campaign-session.ts';
import { BenchApiError } from './errors.ts';
import type { CampaignApi, CampaignMethods, CampaignMethodsOptions } from './ports.ts';

function refusal(error: unknown): never {
  if (error instanceof LimitsError) throw new BenchApiError(error.message, error.field);
  if (error instanceof CampaignBusyError || error instanceof CampaignFileError) throw new BenchApiError(error.message);
  throw error;
}

export function createCampaignMethods(options: CampaignMethodsOptions): CampaignMethods & { api: CampaignApi } {
  let current: CampaignSession | null = null;
  let last: CampaignView | null = null;

  const begin = async (what: Parameters<typeof startCampaignSession>[1]): Promise<CampaignView> => {
    const opened = await options.acquire();
    if (!opened.chamber) {
      options.release();
      throw new BenchApiError(
        'the connected bench has no temperature chamber: add "chamber" to the bench file (or connect the simulated bench)',
        'bench.chamber',
      );
    }
    let session: CampaignSession;
    try {
      session = await startCampaignSession(
        {
          bench: {
            ...opened.roles,
            chamber: opened.chamber,
            instruments: opened.connection.roles.map(({ role, idn, address }) => ({ role, idn, address })),
          },
          clock: opened.clock,
          runsDir: options.runsDir,
          emit: options.emit,
          batchMs: options.batchMs,
        },
        what,
      );
    } catch (error) {
      options.release();
      refusal(error);
    }
    current = session;
    options.started();
    void session.done.finally(() => {
      if (current === session) {
        last = session.view();
        current = null;
      }
      options.release();
    });
    return session.view();
  };

  const api: CampaignApi = {
    startCampaign: (plan) => begin({ plan }),
    async resumeCampaign(id) {
      const dir = join(options.runsDir, id);
      const file = await readCampaignFile(dir).catch((error: unknown) => refusal(error));
      const status = await effectiveStatus(dir, file);
      if (status === 'complete') throw new BenchApiError(`campaign ${id} is complete: nothing to resume`, 'id');
      if (status === 'running') throw new BenchApiError(`campaign ${id} is still running`, 'id');
      return begin({ dir, file });
    },
    async stopCampaign() {
      if (!current) throw new BenchApiError('no campaign in progress');
      current.control.stop('stop');
    },
    async confirmUnitChange() {
      if (!current?.confirmUnitChange()) throw new BenchApiError('no unit change is awaited');
    },
    getCampaign: async () => current?.view() ?? last,
    listCampaigns: () => listCampaignFolders(options.runsDir),
    async campaignDatasheet(id) {
      const { file, analysis } = await loadCampaign(join(options.runsDir, id)).catch((error: unknown) =>
        refusal(error),
      );
      const sheet: CampaignSheet = {
        id: file.id,
        simulated: analysis.simulated,
        conditions: campaignConditionsText(analysis),
        rows: campaignSheetRows(analysis).map((r) => ({
          parameter: r.parameter,
          conditions: r.conditions,
          min: cell(r.min, r.unit),
          typ: cell(r.typ, r.unit),
          max: cell(r.max, r.unit),
        })),
        headroomHeading: `Tuning headroom over temperature (hold ${formatFigure(analysis.headroomTargetHz, 'Hz', { digits: 6 })})`,
        headroom: analysis.headroom.map(headroomCells),
        markdown: renderCampaignMarkdown(analysis, `Campaign ${file.id}`),
      };
      return sheet;
    },
  };

  return {
    api,
    running: (): boolean => current !== null,
    /** Stops the campaign (if any) and waits for its safe state. */
    async stopAndWait(): Promise<void> {
      const session = current;
      if (!session) return;
      session.control.stop('stop');
      await session.done;
    },
    /** Last resort: stop, and report whether its safe state was confirmed within `ms`. */
    async stopWithin(ms: number): Promise<boolean> {
      const session = current;
      if (!session) return true;
      session.control.stop('stop');
      const outcome = await Promise.race([
        session.done,
        new Promise<null>((resolve) => setTimeout(() => resolve(null), ms).unref()),
      ]);
      return outcome?.safeStateOk ?? false;
    },
  };
}

function cell(f: { value: number; uncertainty: number | null } | null, unit: string): string {
  return f === null ? '' : formatFigure(f.value, unit, { uncertainty: f.uncertainty });
}

/**
 * What the BenchApi service needs from the rest of main/, as narrow ports.
 * main/service/default-ports.ts fills them with the real modules (store,
 * procedures, bench assembly, simulator); tests fill them with fakes.
 */
import type {
  BenchApi,
  BenchEvent,
  ConnectionState,
  RunDetail,
  RunKind,
  RunMeta,
  SerialPortInfo,
} from '../../app/contract/bench-api.ts';
import type { BenchConfig } from '../../app/contract/plans.ts';
import type { RunControl } from '../procedures/run-control.ts';
import type { BenchRoles, ProcedureOutcome, ProcedureProgress, RunSink } from '../procedures/types.ts';
import type { Chamber } from '../instruments/roles.ts';
import type { Clock } from '../time/clock.ts';
import type { ImportStream } from './import-off-thread.ts';

export interface OpenedBench {
  roles: BenchRoles;
  /** The temperature chamber (campaigns), when the bench has one; the simulated bench always does. */
  chamber?: Chamber | undefined;
  connection: ConnectionState;
  /** The clock procedures use on this bench (the simulated bench may run faster than real time). */
  clock: Clock;
  /** Closes every link (after the procedures left the supply safe). */
  close(): Promise<void>;
}

export interface ProcedureRun {
  bench: BenchRoles;
  plan: unknown;
  clock: Clock;
  sink: RunSink;
  control: RunControl;
  onProgress: (progress: ProcedureProgress) => void;
  runId: string;
}

export interface ProcedurePort {
  columns: readonly string[];
  /** Throws LimitsError (naming the field) for a plan to refuse before its run folder exists. */
  validate?(plan: unknown, roles: ProcedureRun['bench']): void;
  run(options: ProcedureRun): Promise<ProcedureOutcome>;
}

export interface RunStorePort {
  list(): Promise<RunMeta[]>;
  open(id: string): Promise<RunDetail>;
  rename(id: string, dutId: string): Promise<RunMeta>;
  addNote(id: string, text: string): Promise<void>;
  delete(id: string): Promise<void>;
  restore(id: string): Promise<RunMeta>;
  importCsv(fileName: string, csvText: string, dutId: string): Promise<RunMeta>;
  /** The same import fed as UTF-8 slices (browser mode's streamed upload). */
  openImport?(fileName: string, dutId: string): ImportStream;
}

export interface ServicePorts {
  runsDir: string;
  openBench(config: BenchConfig | 'sim'): Promise<OpenedBench>;
  listSerialPorts(): Promise<SerialPortInfo[]>;
  listProfiles(): Promise<{ name: string; role: string }[]>;
  store: RunStorePort;
  procedures: Partial<Record<RunKind, ProcedurePort>>;
  /**
   * The campaign methods (./campaign-methods.ts), given as a port so that a service without a chamber
   * (the web edition's page) loads none of the campaign's folder code; absent: no campaigns.
   */
  campaigns?: (options: CampaignMethodsOptions) => CampaignMethods;
}

export interface CampaignMethodsOptions {
  runsDir: string;
  emit: (event: BenchEvent) => void;
  batchMs?: number | undefined;
  /** The idle bench, with the live poll stopped; throws when it is busy or absent. */
  acquire(): Promise<OpenedBench>;
  /** The campaign has started (or was refused): other starts may proceed to be refused by `running()`. */
  started(): void;
  /** The campaign has ended: the bench is the service's again. */
  release(): void;
}

export type CampaignApi = Required<
  Pick<
    BenchApi,
    | 'startCampaign'
    | 'resumeCampaign'
    | 'stopCampaign'
    | 'confirmUnitChange'
    | 'getCampaign'
    | 'listCampaigns'
    | 'campaignDatasheet'
  >
>;

/** What the bench service holds of the campaign methods (one value of `createCampaignMethods`). */
export interface CampaignMethods {
  api: Partial<CampaignApi>;
  running(): boolean;
  stopAndWait(): Promise<void>;
  stopWithin(ms: number): Promise<boolean>;
}

/** The bench connection: role identities, live readouts, ports and profiles on offer. */
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { BenchApi, BenchStatus, ConnectionState, LiveReadout, SerialPortInfo } from '../contract/bench-api.ts';
import type { BenchConfig } from '../contract/plans.ts';
import { errorText } from '../bridge/bench-call-error.ts';

export interface ConnectionStoreState {
  connection: ConnectionState;
  readout: LiveReadout | null;
  /** What the bench is doing (main's status: the run's own readings during a run). */
  status: BenchStatus | null;
  /** The last bench asked for, so a lost link can be reopened with one click. */
  lastConfig: BenchConfig | 'sim' | null;
  ports: SerialPortInfo[];
  profiles: { name: string; role: string }[];
  busy: boolean;
  error: string | null;
  /** Browser mode: other pages driving the same bench right now (0 on the desktop). */
  peers: number;
}

export interface ConnectionActions {
  refresh: () => Promise<void>;
  connect: (config: BenchConfig | 'sim') => Promise<boolean>;
  disconnect: () => Promise<void>;
  setConnection: (state: ConnectionState) => void;
  setReadout: (readout: LiveReadout) => void;
  setStatus: (status: BenchStatus) => void;
  /** Opens the last bench again (after a lost link). */
  reconnect: () => Promise<boolean>;
  setPeers: (others: number) => void;
}

export type ConnectionStore = StoreApi<ConnectionStoreState & ConnectionActions>;

export const DISCONNECTED: ConnectionState = { connected: false, simulated: false, roles: [], error: null };

export function createConnectionStore(bench: BenchApi): ConnectionStore {
  return createStore<ConnectionStoreState & ConnectionActions>()((set, get) => {
    async function guarded(work: () => Promise<void>): Promise<boolean> {
      set({ busy: true, error: null });
      try {
        await work();
        set({ busy: false });
        return true;
      } catch (error) {
        set({ busy: false, error: errorText(error) });
        return false;
      }
    }
    return {
      connection: DISCONNECTED,
      readout: null,
      status: null,
      lastConfig: null,
      ports: [],
      profiles: [],
      busy: false,
      error: null,
      peers: 0,
      async refresh() {
        await guarded(async () => {
          const [connection, ports, profiles, status] = await Promise.all([
            bench.getConnection(),
            bench.listSerialPorts(),
            bench.listProfiles(),
            bench.getBenchStatus(),
          ]);
          set({ connection, ports, profiles, status });
        });
      },
      connect(config) {
        set({ lastConfig: config });
        return guarded(async () => {
          const connection = await bench.connect(config);
          set({ connection, error: connection.error });
        });
      },
      async disconnect() {
        await guarded(async () => {
          set({ connection: await bench.disconnect(), readout: null });
        });
      },
      setConnection(connection) {
        set({ connection, ...(connection.connected ? {} : { readout: null }) });
      },
      setReadout(readout) {
        set({ readout });
      },
      setStatus(status) {
        set({ status });
      },
      reconnect() {
        const config = get().lastConfig;
        if (config !== null) return get().connect(config);
        // After a reload the page no longer holds the bench file it opened (addresses, profiles); guessing
        // one from the addresses alone could drive an instrument with the wrong commands, so say so.
        set({
          error:
            'this page was reloaded since the bench was opened, so it cannot reopen it by itself: choose the instruments again on the Bench screen and connect',
        });
        return Promise.resolve(false);
      },
      setPeers(others) {
        set({ peers: others });
      },
    };
  });
}

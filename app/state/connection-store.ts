/** The bench connection: role identities, live readouts, ports and profiles on offer. */
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { BenchApi, ConnectionState, LiveReadout, SerialPortInfo } from '../contract/bench-api.ts';
import type { BenchConfig } from '../contract/plans.ts';
import { errorText } from '../bridge/bench-call-error.ts';

export interface ConnectionStoreState {
  connection: ConnectionState;
  readout: LiveReadout | null;
  ports: SerialPortInfo[];
  profiles: { name: string; role: string }[];
  busy: boolean;
  error: string | null;
  /** Browser mode: other pages driving the same bench right now (0 on the desktop). */
  peers: number;
}

export interface ConnectionActions {
  refresh(): Promise<void>;
  connect(config: BenchConfig | 'sim'): Promise<boolean>;
  disconnect(): Promise<void>;
  setConnection(state: ConnectionState): void;
  setReadout(readout: LiveReadout): void;
  setPeers(others: number): void;
}

export type ConnectionStore = StoreApi<ConnectionStoreState & ConnectionActions>;

export const DISCONNECTED: ConnectionState = { connected: false, simulated: false, roles: [], error: null };

export function createConnectionStore(bench: BenchApi): ConnectionStore {
  return createStore<ConnectionStoreState & ConnectionActions>()((set) => {
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
      ports: [],
      profiles: [],
      busy: false,
      error: null,
      peers: 0,
      async refresh() {
        await guarded(async () => {
          const [connection, ports, profiles] = await Promise.all([bench.getConnection(), bench.listSerialPorts(), bench.listProfiles()]);
          set({ connection, ports, profiles });
        });
      },
      connect(config) {
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
      setPeers(others) {
        set({ peers: others });
      },
    };
  });
}

/** View settings: theme, the screen on show, and drafts kept while moving between screens. */
import { createStore, type StoreApi } from 'zustand/vanilla';
import {
  DEFAULT_DRIFT,
  DEFAULT_LIMITS,
  DEFAULT_SWEEP,
  type DriftDraft,
  type LimitsDraft,
  type SweepDraft,
} from './plan-drafts.ts';

export type ThemeChoice = 'system' | 'dark' | 'light';
export const SCREENS = ['bench', 'sweep', 'drift', 'runs', 'datasheet', 'loop', 'campaign'] as const;
export type ScreenName = (typeof SCREENS)[number];

export interface SettingsState {
  theme: ThemeChoice;
  screen: ScreenName;
  dutId: string;
  limits: LimitsDraft;
  sweepDraft: SweepDraft;
  driftDraft: DriftDraft;
}

export interface SettingsActions {
  setTheme: (theme: ThemeChoice) => void;
  cycleTheme: () => void;
  show: (screen: ScreenName) => void;
  setDutId: (dutId: string) => void;
  editLimits: (patch: Partial<LimitsDraft>) => void;
  editSweep: (patch: Partial<SweepDraft>) => void;
  editDrift: (patch: Partial<DriftDraft>) => void;
}

export type SettingsStore = StoreApi<SettingsState & SettingsActions>;

/** Where the theme choice is remembered; `localStorage` in the app, a Map in tests. */
export interface KeyValue {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
}

const THEME_KEY = 'tunebench.theme';
const NEXT_THEME: Record<ThemeChoice, ThemeChoice> = { system: 'dark', dark: 'light', light: 'system' };

function readTheme(storage: KeyValue | null): ThemeChoice {
  const stored = storage?.getItem(THEME_KEY);
  return stored === 'dark' || stored === 'light' ? stored : 'system';
}

export function createSettingsStore(storage: KeyValue | null = null): SettingsStore {
  return createStore<SettingsState & SettingsActions>()((set, get) => ({
    theme: readTheme(storage),
    screen: 'bench',
    dutId: 'clkmul-vco-01',
    limits: DEFAULT_LIMITS,
    sweepDraft: DEFAULT_SWEEP,
    driftDraft: DEFAULT_DRIFT,
    setTheme(theme) {
      storage?.setItem(THEME_KEY, theme);
      set({ theme });
    },
    cycleTheme() {
      get().setTheme(NEXT_THEME[get().theme]);
    },
    show(screen) {
      set({ screen });
    },
    setDutId(dutId) {
      set({ dutId });
    },
    editLimits(patch) {
      set({ limits: { ...get().limits, ...patch } });
    },
    editSweep(patch) {
      set({ sweepDraft: { ...get().sweepDraft, ...patch } });
    },
    editDrift(patch) {
      set({ driftDraft: { ...get().driftDraft, ...patch } });
    },
  }));
}

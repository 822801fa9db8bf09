/**
 * What the campaign screen draws, fed by main's pushed events: the
 * campaign's state, its soak readings (setpoint, air, DUT) and the readings
 * of the condition being swept. One feed per bridge, subscribed on first
 * use, so the soak history survives leaving the screen and coming back.
 * Columns grow in place; watchers are told at most once per batch.
 */
import type { BenchApi, BenchEvent } from '../../contract/bench-api.ts';
import type { CampaignView } from '../../contract/campaign-schemas.ts';
import { counterReadout, type Readout } from '../../plots/readout.ts';

export interface CampaignFeed {
  campaign: CampaignView | null;
  soak: { t: number[]; setpoint: number[]; air: (number | null)[]; dut: number[] };
  /** The condition being swept: control voltages, readings, and the counter gate they were read with (null: unknown). */
  sweep: { index: number; v: number[]; f: (number | null)[]; gateS: number | null };
  version: number;
  watch: (listener: () => void) => () => void;
  /** Replaces the state (a reply to getCampaign/start/resume). */
  show: (view: CampaignView | null) => void;
}

const emptySweep = (): CampaignFeed['sweep'] => ({ index: -1, v: [], f: [], gateS: null });

const feeds = new WeakMap<BenchApi, CampaignFeed>();

export function campaignFeed(api: BenchApi): CampaignFeed {
  const existing = feeds.get(api);
  if (existing) return existing;
  const listeners = new Set<() => void>();
  const feed: CampaignFeed = {
    campaign: null,
    soak: { t: [], setpoint: [], air: [], dut: [] },
    sweep: emptySweep(),
    version: 0,
    watch: (listener) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    show: (view) => {
      if (view !== null && view.id !== feed.campaign?.id) {
        feed.soak = { t: [], setpoint: [], air: [], dut: [] };
        feed.sweep = emptySweep();
      }
      feed.campaign = view;
      changed();
    },
  };
  const changed = (): void => {
    feed.version += 1;
    for (const listener of listeners) listener();
  };
  api.subscribe((event: BenchEvent) => {
    if (event.type === 'campaign') feed.show(event.campaign);
    else if (event.type === 'campaign-soak') {
      for (const s of event.samples) {
        feed.soak.t.push(s.timeS);
        feed.soak.setpoint.push(s.setpointC);
        feed.soak.air.push(s.airC);
        feed.soak.dut.push(s.dutC);
      }
      changed();
    } else if (event.type === 'campaign-sweep') {
      if (event.index !== feed.sweep.index) feed.sweep = { ...emptySweep(), index: event.index };
      if (event.gateS !== undefined) feed.sweep.gateS = event.gateS;
      for (const p of event.points) {
        feed.sweep.v.push(p.controlV);
        feed.sweep.f.push(p.frequencyHz);
      }
      changed();
    }
  });
  feeds.set(api, feed);
  return feed;
}

/** The live sweep's readings resolve 1/gate of the counter that read them (7 significant digits while the gate is unknown). */
export function liveReadingReadout(sweep: CampaignFeed['sweep']): Readout {
  return counterReadout(sweep.gateS);
}

/**
 * Campaign screen: the plan (checked against the campaign-plan schema as you
 * type), the archive of campaign folders (resume an interrupted one, open a
 * datasheet), the grid of conditions, the soak plot, the live sweep, the
 * unit-change dialog and the campaign datasheet. The chamber cautions stay
 * on screen throughout.
 */
import { useEffect, useMemo, useState, useSyncExternalStore } from 'react';
import type { CampaignSheet, CampaignSummary } from '../../contract/campaign-schemas.ts';
import {
  baseOptions,
  lineSeries,
  pointSeries,
  readoutTicks,
  siAxis,
  timeAxis,
  xSeries,
} from '../../plots/plot-options.ts';
import { celsiusReadout, voltsReadout, type Readout } from '../../plots/readout.ts';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { useApp } from '../app-context.ts';
import { ConfirmAction } from '../controls/ConfirmAction.tsx';
import { Panel } from '../controls/Field.tsx';
import { campaignFeed, liveReadingReadout } from './campaign-feed.ts';
import { CampaignDatasheet, ChamberCautions, ConditionGrid, UnitChangeDialog } from './CampaignParts.tsx';
import { checkPlanText, STARTER_PLAN } from './plan-text.ts';
import './campaign.css';

const STATUS_TEXT: Record<CampaignSummary['status'], string> = {
  running: 'running',
  complete: 'complete',
  aborted: 'stopped',
  failed: 'failed',
  interrupted: 'interrupted',
};

/** Soak readings come about once a second: their time to the second. */
const SOAK_TIME: Readout = { unit: 's', clock: true, resolution: 1 };

export function CampaignScreen() {
  const { bridge, stores } = useApp();
  const api = bridge.api;
  const feed = useMemo(() => campaignFeed(api), [api]);
  useSyncExternalStore(feed.watch, () => feed.version);
  const campaign = feed.campaign;
  const liveReading = liveReadingReadout(feed.sweep);
  const [text, setText] = useState(() => JSON.stringify(STARTER_PLAN, null, 2));
  const check = useMemo(() => checkPlanText(text), [text]);
  const [archive, setArchive] = useState<CampaignSummary[]>([]);
  const [sheet, setSheet] = useState<CampaignSheet | null>(null);
  const [busy, setBusy] = useState(false);
  const supported = typeof api.startCampaign === 'function';
  const running = campaign?.active === true;

  const fail = (error: unknown): void =>
    stores.notice.setState({ message: error instanceof Error ? error.message : String(error) });
  const refresh = (): void => {
    void api.listCampaigns?.().then(setArchive, fail);
  };
  useEffect(() => {
    void api.getCampaign?.().then((view) => {
      if (view && view.id !== feed.campaign?.id) feed.show(view);
    }, fail);
    refresh();
  }, [api]);
  // The archive follows the campaign's end.
  useEffect(refresh, [campaign?.status]);

  const act = async (work: () => Promise<unknown>): Promise<void> => {
    setBusy(true);
    try {
      await work();
    } catch (error) {
      fail(error);
    } finally {
      setBusy(false);
    }
  };
  const openSheet = (id: string): Promise<void> =>
    act(async () => {
      const got = await api.campaignDatasheet?.(id);
      if (got) setSheet(got);
    });

  if (!supported)
    return (
      <div className="screen campaign-screen">
        <ChamberCautions />
        <p className="muted">Campaigns need the desktop app or `tunebench serve`: this edition has no chamber.</p>
      </div>
    );

  return (
    <div className="screen campaign-screen" data-testid="campaign-screen">
      <ChamberCautions />
      <div className="campaign-top">
        <Panel title="Campaign plan" testId="campaign-plan">
          <textarea
            className="plan-text"
            spellCheck={false}
            value={text}
            onChange={(e) => setText(e.target.value)}
            disabled={running}
            aria-label="Campaign plan (JSON)"
            data-testid="campaign-plan-text"
            rows={18}
          />
          {check.ok ? (
            <p className="muted" data-testid="campaign-plan-ok">
              Plan checks out. Keys and forms: resources/docs/reference.md, "Campaign plan".
            </p>
          ) : (
            <ul className="plan-problems" data-testid="campaign-plan-problems" role="alert">
              {check.problems.map((p) => (
                <li key={p}>{p}</li>
              ))}
            </ul>
          )}
          <div className="actions">
            <button
              type="button"
              disabled={!check.ok || running || busy}
              data-testid="campaign-start"
              onClick={() =>
                void act(async () => {
                  if (!check.ok) return;
                  setSheet(null);
                  const view = await api.startCampaign?.(check.plan);
                  if (view) feed.show(view);
                })
              }
            >
              Start campaign
            </button>
            {running ? (
              <ConfirmAction
                label="Stop campaign"
                question="Stop the campaign? The control and DUT supply outputs go off and the chamber goes to the plan's safe temperature. Finished conditions stay; it can be resumed from the list."
                confirmLabel="Stop and make safe"
                onConfirm={() => void act(async () => api.stopCampaign?.())}
                className="danger"
                testId="campaign-stop"
              />
            ) : null}
          </div>
        </Panel>
        <Panel title="Campaign folders" testId="campaign-archive">
          {archive.length === 0 ? <p className="muted">No campaign in this runs folder yet.</p> : null}
          <ul className="campaign-list">
            {archive.map((c) => (
              <li key={c.id} data-testid={`campaign-item-${c.id}`}>
                <span className="campaign-id">{c.id}</span>
                <span className={`badge status-${c.status}`}>{STATUS_TEXT[c.status]}</span>
                <span className="muted">
                  {c.done} of {c.conditions} done · {c.units.join(', ')}
                </span>
                {c.status === 'interrupted' || c.status === 'aborted' || c.status === 'failed' ? (
                  <button
                    type="button"
                    className="quiet"
                    disabled={running || busy}
                    data-testid={`campaign-resume-${c.id}`}
                    onClick={() =>
                      void act(async () => {
                        const view = await api.resumeCampaign?.(c.id);
                        if (view) feed.show(view);
                      })
                    }
                  >
                    Resume
                  </button>
                ) : null}
                {c.done > 0 ? (
                  <button
                    type="button"
                    className="quiet"
                    disabled={busy}
                    data-testid={`campaign-sheet-${c.id}`}
                    onClick={() => void openSheet(c.id)}
                  >
                    Datasheet
                  </button>
                ) : null}
              </li>
            ))}
          </ul>
        </Panel>
      </div>
      {campaign ? (
        <Panel
          title={`Conditions — ${campaign.id}`}
          testId="campaign-state"
          actions={
            <span className="muted" data-testid="campaign-status" data-status={campaign.status}>
              {campaign.active ? 'running' : STATUS_TEXT[campaign.status]}
              {campaign.reason ? ` (${campaign.reason})` : ''}
              {campaign.safeStateOk === false ? ' — safe state NOT confirmed: check the supply and the chamber' : ''}
            </span>
          }
        >
          <ConditionGrid campaign={campaign} />
          {!campaign.active && campaign.conditions.some((c) => c.state === 'done') ? (
            <button type="button" data-testid="campaign-open-sheet" onClick={() => void openSheet(campaign.id)}>
              Campaign datasheet
            </button>
          ) : null}
        </Panel>
      ) : null}
      <div className="campaign-plots">
        <PlotPanel
          testId="soak-plot"
          title="Soak: setpoint, chamber air and DUT temperature"
          buildKey="soak"
          height={240}
          watch={feed.watch}
          isEmpty={feed.soak.t.length === 0}
          emptyText="Soak readings appear here while the chamber settles."
          data={() => [feed.soak.t, feed.soak.setpoint, feed.soak.air, feed.soak.dut]}
          options={(colors, width, height) =>
            baseOptions(
              width,
              height,
              [
                xSeries('Campaign time', SOAK_TIME),
                lineSeries('Setpoint', colors.series[3], celsiusReadout, { dash: [6, 4] }),
                lineSeries('Air', colors.series[2], celsiusReadout),
                lineSeries('DUT', colors.series[0], celsiusReadout, { width: 2 }),
              ],
              [timeAxis(colors, 'Campaign time'), siAxis(colors, 'Temperature', '°C', { size: 64 })],
            )
          }
        />
        <PlotPanel
          testId="campaign-sweep-plot"
          title={
            feed.sweep.index >= 0
              ? `Live sweep — condition ${feed.sweep.index + 1}`
              : 'Live sweep (the condition being swept)'
          }
          buildKey={`campaign-sweep ${feed.sweep.gateS ?? 'gate unknown'}`}
          height={240}
          watch={feed.watch}
          isEmpty={feed.sweep.v.length === 0}
          emptyText="Readings of the condition being swept appear here."
          cursorReadouts={{ x: voltsReadout, y: liveReading }}
          data={() => [feed.sweep.v, feed.sweep.f]}
          options={(colors, width, height) =>
            baseOptions(
              width,
              height,
              [xSeries('Control', voltsReadout), pointSeries('Frequency', colors.series[0], liveReading)],
              [
                siAxis(colors, 'Control voltage', 'V'),
                siAxis(colors, 'Frequency', 'Hz', { size: 84, ...readoutTicks(liveReading) }),
              ],
            )
          }
        />
      </div>
      {sheet ? (
        <Panel title={`Campaign datasheet — ${sheet.id}`} testId="campaign-datasheet">
          <CampaignDatasheet sheet={sheet} />
        </Panel>
      ) : null}
      {campaign?.unitChange ? (
        <UnitChangeDialog
          change={campaign.unitChange}
          onDone={() => void act(async () => api.confirmUnitChange?.())}
          onStop={() => void act(async () => api.stopCampaign?.())}
        />
      ) : null}
    </div>
  );
}

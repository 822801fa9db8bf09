/** Pieces of the campaign screen: the cautions, the grid of conditions, the unit-change dialog, the datasheet. */
import { useEffect, useRef } from 'react';
import type { CampaignSheet, CampaignView } from '../../contract/campaign-schemas.ts';
import { formatFigure } from '../../analysis/format-figure.ts';

/** Shown whenever the screen is: a chamber runs for hours with nobody watching. */
export function ChamberCautions() {
  return (
    <aside className="chamber-cautions" data-testid="chamber-cautions" aria-label="Chamber cautions">
      <strong>Before an unattended chamber run</strong>
      <ul>
        <li>
          Cold setpoints bring condensation and frost: let the chamber come back above the dew point before the door
          opens, and keep water off powered boards.
        </li>
        <li>Hot setpoints leave fixtures, cables and the door seal hot enough to burn.</li>
        <li>Keep the door interlocks working; never bypass them to reach a unit.</li>
        <li>Your lab&apos;s rules and the chamber maker&apos;s instructions come first.</li>
      </ul>
    </aside>
  );
}

const STATE_TEXT: Record<CampaignView['conditions'][number]['state'], string> = {
  waiting: 'waiting',
  soaking: 'soaking',
  sweeping: 'sweeping',
  done: 'done',
  failed: 'failed',
  skipped: 'skipped',
};

const celsius = (t: number): string => formatFigure(t, '°C', { resolution: 0.1 });
const volts = (v: number): string => formatFigure(v, 'V', { resolution: 0.001 });

/** One table per unit: a row per chamber temperature, a column per DUT supply. */
export function ConditionGrid({ campaign }: { campaign: CampaignView }) {
  const units = [...new Set(campaign.conditions.map((c) => c.unit))];
  const supplies = [...new Set(campaign.conditions.map((c) => c.supplyV))].sort((a, b) => a - b);
  return (
    <div className="condition-grid" data-testid="condition-grid">
      {units.map((unit) => {
        const mine = campaign.conditions.filter((c) => c.unit === unit);
        const temps = [...new Set(mine.map((c) => c.temperatureC))];
        return (
          <table key={unit} className="condition-table">
            <caption>{unit}</caption>
            <thead>
              <tr>
                <th scope="col">Chamber</th>
                {supplies.map((s) => (
                  <th key={s} scope="col">
                    {volts(s)}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {temps.map((t) => (
                <tr key={t}>
                  <th scope="row">{celsius(t)}</th>
                  {supplies.map((s) => {
                    const c = mine.find((x) => x.temperatureC === t && x.supplyV === s);
                    if (!c) return <td key={s} />;
                    return (
                      <td
                        key={s}
                        className={`cond cond-${c.state}`}
                        data-testid={`cond-${c.index}`}
                        data-state={c.state}
                        title={c.message ?? undefined}
                      >
                        {STATE_TEXT[c.state]}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        );
      })}
    </div>
  );
}

/** The campaign waits here between units; nothing else on the screen is reachable until it is answered. */
export function UnitChangeDialog(props: {
  change: NonNullable<CampaignView['unitChange']>;
  onDone: () => void;
  onStop: () => void;
}) {
  const ref = useRef<HTMLButtonElement | null>(null);
  useEffect(() => ref.current?.focus(), []);
  return (
    <div className="modal-backdrop">
      <div
        className="modal unit-change"
        role="dialog"
        aria-modal="true"
        aria-labelledby="unit-change-title"
        data-testid="unit-change"
      >
        <h2 id="unit-change-title">Change the unit</h2>
        <p>
          Take out <strong>{props.change.from}</strong> and mount <strong>{props.change.to}</strong>.
        </p>
        <p>
          The DUT supply and the control output are off, and the chamber has been brought to{' '}
          {celsius(props.change.safeC)}. Check the air and the fixture yourself before you reach in; frost or a hot
          fixture means wait.
        </p>
        <div className="actions">
          <button type="button" className="quiet" onClick={props.onStop} data-testid="unit-change-stop">
            Stop the campaign here
          </button>
          <button type="button" ref={ref} onClick={props.onDone} data-testid="unit-change-done">
            {props.change.to} is in, door closed — carry on
          </button>
        </div>
      </div>
    </div>
  );
}

export function CampaignDatasheet({ sheet }: { sheet: CampaignSheet }) {
  return (
    <div className="campaign-sheet" data-testid="campaign-sheet">
      {sheet.simulated ? (
        <p className="sim-banner" data-testid="campaign-sheet-simulated">
          Simulated bench: these figures come from the built-in simulator, not from hardware.
        </p>
      ) : null}
      <p className="muted">{sheet.conditions}</p>
      <table className="datasheet-table">
        <thead>
          <tr>
            <th>Parameter</th>
            <th>Conditions</th>
            <th>Min</th>
            <th>Typ</th>
            <th>Max</th>
          </tr>
        </thead>
        <tbody>
          {sheet.rows.map((r) => (
            <tr key={r.parameter}>
              <td>{r.parameter}</td>
              <td>{r.conditions}</td>
              <td className="num">{r.min}</td>
              <td className="num">{r.typ}</td>
              <td className="num">{r.max}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <h3>{sheet.headroomHeading}</h3>
      <table className="datasheet-table" data-testid="campaign-headroom">
        <thead>
          <tr>
            <th>Unit</th>
            <th>Chamber</th>
            <th>DUT</th>
            <th>Control voltage</th>
            <th>Margin low</th>
            <th>Margin high</th>
            <th>Stall edge</th>
            <th>Holds</th>
          </tr>
        </thead>
        <tbody>
          {sheet.headroom.map((h) => (
            <tr key={`${h.unit}-${h.chamber}`}>
              <td>{h.unit}</td>
              <td>{h.chamber}</td>
              <td>{h.dut}</td>
              <td className="num">{h.controlV}</td>
              <td className="num">{h.marginLow}</td>
              <td className="num">{h.marginHigh}</td>
              <td className="num">{h.stall}</td>
              <td>{h.holds}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/**
 * The designed filter rounded to parts one can buy: R and C each to the
 * E series the user picks, and the loop checked again on the rounded values
 * at every Kvco corner (crossover and phase margin recomputed, not assumed).
 */
import { useState } from 'react';
import { evaluateLoop } from '../../analysis/loop-filter-eval.ts';
import type { LoopFilter } from '../../analysis/loop-filter.ts';
import { Choice } from '../controls/Field.tsx';
import { formatFigure } from '../../analysis/format-figure.ts';
import { degreesText } from './bode-options.ts';
import { roundFilter, type ESeries } from './e-series.ts';

export interface RoundedComponentsProps {
  filter: LoopFilter;
  dividerN: number;
  chargePumpA: number;
  corners: readonly { label: string; kvcoHzPerV: number; crossoverHz: number; phaseMarginDeg: number }[];
}

const R_SERIES: { value: ESeries; label: string }[] = [
  { value: 'E12', label: 'E12 (10 %)' },
  { value: 'E24', label: 'E24 (5 %)' },
  { value: 'E96', label: 'E96 (1 %)' },
];
const C_SERIES: { value: ESeries; label: string }[] = [
  { value: 'E6', label: 'E6 (20 %)' },
  { value: 'E12', label: 'E12 (10 %)' },
];

export function RoundedComponents(props: RoundedComponentsProps) {
  const [rSeries, setRSeries] = useState<ESeries>('E24');
  const [cSeries, setCSeries] = useState<ESeries>('E12');
  const rounded = roundFilter(props.filter, rSeries, cSeries);
  const parts: [string, number | null, string][] = [
    ['C1', rounded.c1F, 'F'],
    ['R2', rounded.r2Ohm, 'Ω'],
    ['C2', rounded.c2F, 'F'],
    ['R3', rounded.r3Ohm, 'Ω'],
    ['C3', rounded.c3F, 'F'],
  ];
  return (
    <div data-testid="loop-rounded">
      <h2>Rounded to preferred values</h2>
      <div className="row">
        <Choice<ESeries>
          label="Resistors"
          value={rSeries}
          options={R_SERIES}
          onChange={setRSeries}
          testId="loop-r-series"
        />
        <Choice<ESeries>
          label="Capacitors"
          value={cSeries}
          options={C_SERIES}
          onChange={setCSeries}
          testId="loop-c-series"
        />
      </div>
      <p className="muted">
        {parts
          .filter(([, value]) => value !== null)
          .map(([name, value, unit]) => `${name} ${formatFigure(value, unit, { digits: 3 })}`)
          .join(' · ')}
      </p>
      <table className="table" data-testid="loop-rounded-checks">
        <thead>
          <tr>
            <th scope="col">Kvco</th>
            <th scope="col">Crossover, rounded</th>
            <th scope="col">Margin, rounded</th>
          </tr>
        </thead>
        <tbody>
          {props.corners.map((corner) => {
            const check = evaluateLoop(rounded, {
              dividerN: props.dividerN,
              chargePumpA: props.chargePumpA,
              kvcoHzPerV: corner.kvcoHzPerV,
            });
            return (
              <tr key={corner.label} data-testid="loop-rounded-row">
                <td>{corner.label}</td>
                <td>
                  {formatFigure(check.crossoverHz, 'Hz', { digits: 3 })}{' '}
                  <span className="muted">({formatFigure(corner.crossoverHz, 'Hz', { digits: 3 })} designed)</span>
                </td>
                <td>
                  {degreesText(check.phaseMarginDeg)}{' '}
                  <span className="muted">({degreesText(corner.phaseMarginDeg)} designed)</span>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

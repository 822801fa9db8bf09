/**
 * The designed loop filter: its components, crossover and phase margin at
 * each Kvco corner (an unusable corner with its reason), the designer's
 * warnings, and the filter rounded to preferred values and checked again.
 */
import { formatFigure } from '../../analysis/format-figure.ts';
import type { LoopDesign } from '../../analysis/loop-filter.ts';
import type { KvcoCorner } from '../../analysis/loop-operating-point.ts';
import { Figure } from '../controls/Field.tsx';
import { degreesText } from './bode-options.ts';
import { CORNER_LABELS, type CornerCheck } from './loop-design.ts';
import { RoundedComponents } from './RoundedComponents.tsx';

export interface LoopResultsProps {
  design: LoopDesign;
  checks: readonly CornerCheck[];
  unusable: readonly KvcoCorner[];
  dividerN: number;
  chargePumpA: number;
}

/** A component value to three significant digits (the E96 series' resolution). */
export const part = (value: number, unit: string): string => formatFigure(value, unit, { digits: 3 });

export function LoopResults(props: LoopResultsProps) {
  const f = props.design.filter;
  return (
    <section className="key-figures" aria-label="Loop filter" data-testid="loop-components">
      <h2>Components</h2>
      <dl className="figures">
        <Figure label="C1" value={part(f.c1F, 'F')} testId="loop-c1" />
        <Figure label="R2" value={part(f.r2Ohm, 'Ω')} testId="loop-r2" />
        <Figure label="C2" value={part(f.c2F, 'F')} testId="loop-c2" />
        {f.r3Ohm !== null ? <Figure label="R3" value={part(f.r3Ohm, 'Ω')} testId="loop-r3" /> : null}
        {f.c3F !== null ? <Figure label="C3" value={part(f.c3F, 'F')} testId="loop-c3" /> : null}
      </dl>
      <h2>At each Kvco</h2>
      <table className="table" data-testid="loop-checks">
        <thead>
          <tr>
            <th scope="col">Kvco</th>
            <th scope="col">Crossover</th>
            <th scope="col">Margin</th>
          </tr>
        </thead>
        <tbody>
          {props.checks.map((c) => (
            <tr key={c.label}>
              <td>{c.label}</td>
              <td>{formatFigure(c.crossoverHz, 'Hz', { digits: 3 })}</td>
              <td>{degreesText(c.phaseMarginDeg)}</td>
            </tr>
          ))}
          {props.unusable.map((c) => (
            <tr key={`unusable-${c.label}`} data-testid={`loop-unusable-${c.label}`}>
              <td>{CORNER_LABELS[c.label]}</td>
              <td colSpan={2}>not usable: {c.reason}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {props.design.warnings.map((w) => (
        <p key={w} className="warnings">
          {w}
        </p>
      ))}
      <RoundedComponents filter={f} dividerN={props.dividerN} chargePumpA={props.chargePumpA} corners={props.checks} />
      <p className="muted small">{props.design.source}</p>
    </section>
  );
}

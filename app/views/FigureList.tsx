/** Key figures from their text (app/views/figure-text.ts): one `Figure` each. */
import { Figure } from './controls/Field.tsx';
import type { FigureText } from './figure-text.ts';

export function FigureList({ figures }: { figures: readonly FigureText[] }) {
  return (
    <>
      {figures.map((f) => (
        <Figure
          key={f.testId}
          label={f.label}
          value={f.value}
          note={f.note}
          testId={f.testId}
          insignificant={!f.significant}
        />
      ))}
    </>
  );
}

/**
 * What the run plan editors (gain sweep, drift log) share: the text field of
 * one plan key, tied to the draft, its edit and its validation message, and
 * the device-under-test name every run needs.
 */
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field } from './Field.tsx';

/** Renders the field of one plan key: `field(key, label, unit, testId, hint?)`. */
export function planFieldRenderer<D extends object>(
  draft: D,
  errors: Partial<Record<keyof D, string>>,
  edit: (patch: Partial<D>) => void,
) {
  return function planField(key: keyof D & string, label: string, unit: string, testId: string, hint?: string) {
    return (
      <Field
        label={label}
        unit={unit}
        value={String(draft[key])}
        onChange={(value) => edit({ [key]: value } as Partial<D>)}
        error={errors[key]}
        hint={hint}
        testId={testId}
      />
    );
  };
}

/** The DUT name shared by every run screen, and why it cannot start a run yet (undefined when it can). */
export function useDutId(example?: string): {
  dutId: string;
  dutError: string | undefined;
  setDutId: (id: string) => void;
} {
  const { stores } = useApp();
  const dutId = useStore(stores.settings, (s) => s.dutId);
  const setDutId = useStore(stores.settings, (s) => s.setDutId);
  const dutError = dutId.trim() === '' ? `give the device a name${example ? `, e.g. ${example}` : ''}` : undefined;
  return { dutId, dutError, setDutId };
}

export function DutIdField(props: { dut: ReturnType<typeof useDutId>; testId: string }) {
  return (
    <Field
      label="Device under test"
      value={props.dut.dutId}
      onChange={props.dut.setDutId}
      error={props.dut.dutError}
      inputMode="text"
      testId={props.testId}
    />
  );
}

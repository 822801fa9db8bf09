/** A labelled text field with its validation message tied to it for screen readers. */
import { useId, type ReactNode } from 'react';

export interface FieldProps {
  label: string;
  value: string;
  onChange(value: string): void;
  error?: string | undefined;
  hint?: string;
  testId?: string;
  unit?: string;
  disabled?: boolean;
  inputMode?: 'decimal' | 'text' | 'numeric';
}

export function Field(props: FieldProps) {
  const id = useId();
  const messageId = `${id}-msg`;
  return (
    <div className={props.error ? 'field field-bad' : 'field'}>
      <label htmlFor={id}>{props.label}</label>
      <div className="field-input">
        <input
          id={id}
          type="text"
          value={props.value}
          inputMode={props.inputMode ?? 'decimal'}
          spellCheck={false}
          autoComplete="off"
          disabled={props.disabled}
          aria-invalid={props.error ? true : undefined}
          aria-describedby={props.error || props.hint ? messageId : undefined}
          data-testid={props.testId}
          onChange={(event) => props.onChange(event.target.value)}
        />
        {props.unit ? <span className="field-unit">{props.unit}</span> : null}
      </div>
      {props.error ? (
        <p
          id={messageId}
          className="field-error"
          role="alert"
          data-testid={props.testId ? `${props.testId}-error` : undefined}
        >
          {props.error}
        </p>
      ) : props.hint ? (
        <p id={messageId} className="field-hint">
          {props.hint}
        </p>
      ) : null}
    </div>
  );
}

export interface ChoiceProps<T extends string> {
  label: string;
  value: T;
  options: readonly { value: T; label: string }[];
  onChange(value: T): void;
  testId?: string;
  disabled?: boolean;
}

export function Choice<T extends string>(props: ChoiceProps<T>) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>{props.label}</label>
      <select
        id={id}
        value={props.value}
        disabled={props.disabled}
        data-testid={props.testId}
        onChange={(event) => props.onChange(event.target.value as T)}
      >
        {props.options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    </div>
  );
}

export function Panel(props: {
  title: string;
  children: ReactNode;
  className?: string;
  testId?: string;
  actions?: ReactNode;
}) {
  return (
    <section className={`panel ${props.className ?? ''}`} data-testid={props.testId} aria-label={props.title}>
      <header className="panel-head">
        <h2>{props.title}</h2>
        {props.actions ? <div className="panel-actions">{props.actions}</div> : null}
      </header>
      {props.children}
    </section>
  );
}

export function Figure(props: {
  label: string;
  value: string;
  testId: string;
  note?: string;
  insignificant?: boolean;
}) {
  return (
    <div className="figure">
      <dt>{props.label}</dt>
      {/* A figure within 2σ of zero is shown, but never in bold. */}
      <dd data-testid={props.testId} className={props.insignificant ? 'figure-insignificant' : undefined}>
        {props.value}
      </dd>
      {props.note ? <dd className="figure-note">{props.note}</dd> : null}
    </div>
  );
}

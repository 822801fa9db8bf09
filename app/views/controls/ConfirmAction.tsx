/**
 * A button that asks before it acts: the first click opens a short question
 * in place saying what will happen; only the second, explicit button acts.
 * Used for what ends a run (abort, disconnect during a run).
 */
import { useEffect, useRef, useState } from 'react';

export interface ConfirmActionProps {
  label: string;
  /** When null the button acts at once (nothing to lose). */
  question: string | null;
  confirmLabel: string;
  onConfirm(): void;
  disabled?: boolean;
  className?: string;
  testId: string;
}

export function ConfirmAction(props: ConfirmActionProps) {
  const [asking, setAsking] = useState(false);
  const keepRef = useRef<HTMLButtonElement | null>(null);
  useEffect(() => {
    // Focus the harmless choice, so Enter never ends a run by accident.
    if (asking) keepRef.current?.focus();
  }, [asking]);
  if (asking && props.question !== null) {
    return (
      <div className="confirm-box" role="alertdialog" aria-label={props.label} data-testid={`${props.testId}-confirm`}>
        <p>{props.question}</p>
        <div className="actions">
          <button
            type="button"
            className="danger"
            onClick={() => {
              setAsking(false);
              props.onConfirm();
            }}
            data-testid={`${props.testId}-yes`}
          >
            {props.confirmLabel}
          </button>
          <button type="button" ref={keepRef} onClick={() => setAsking(false)} data-testid={`${props.testId}-no`}>
            Keep running
          </button>
        </div>
      </div>
    );
  }
  return (
    <button
      type="button"
      className={props.className}
      disabled={props.disabled}
      onClick={() => (props.question === null ? props.onConfirm() : setAsking(true))}
      data-testid={props.testId}
    >
      {props.label}
    </button>
  );
}

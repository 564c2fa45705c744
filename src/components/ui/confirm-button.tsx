import { useState, type ReactNode } from 'react';
import { Button } from './button';

/**
 * A destructive action that asks once, in place: the button turns into "Confirm" / "Cancel".
 * No modal, so it works the same with a keyboard, a screen reader and a 390 px screen.
 */
export function ConfirmButton({
  children,
  confirmLabel,
  question,
  onConfirm,
  pending,
  disabled,
  'aria-label': ariaLabel,
}: {
  children: ReactNode;
  confirmLabel: string;
  question: string;
  onConfirm: () => void;
  pending?: boolean;
  disabled?: boolean;
  'aria-label'?: string;
}) {
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <Button variant="danger" size="sm" onClick={() => setAsking(true)} disabled={disabled} pending={pending} aria-label={ariaLabel}>
        {children}
      </Button>
    );
  }
  return (
    <span className="inline-flex flex-wrap items-center gap-2" role="group" aria-label={question}>
      <span className="text-sm text-slate-700">{question}</span>
      <Button
        variant="danger"
        size="sm"
        autoFocus
        pending={pending}
        onClick={() => {
          setAsking(false);
          onConfirm();
        }}
      >
        {confirmLabel}
      </Button>
      <Button variant="ghost" size="sm" onClick={() => setAsking(false)}>
        Cancel
      </Button>
    </span>
  );
}

import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button';

interface DialogProps {
  open: boolean;
  title: string;
  onClose: () => void;
  /**
   * Escape or ✕ asks to close: the owner decides (it closes by setting `open` false), e.g. after
   * asking about edits not applied. Without it they close at once.
   */
  onDismiss?: () => void;
  children: ReactNode;
}

const FIRST_FIELD = [
  'input:not([type="hidden"]):not([disabled])',
  'select:not([disabled])',
  'textarea:not([disabled])',
]
  .map((f) => `[data-dialog-body] ${f}`)
  .join(', ');

/** Focuses a dialog's first field (of a group of radios, the checked one); false when it has none. */
function focusFirstField(dialog: HTMLDialogElement): boolean {
  const field = dialog.querySelector<HTMLInputElement>(FIRST_FIELD);
  if (!field) return false;
  const checked =
    field.type === 'radio' && field.name
      ? dialog.querySelector<HTMLInputElement>(
          `input[type="radio"][name="${CSS.escape(field.name)}"]:checked`,
        )
      : null;
  (checked ?? field).focus();
  return true;
}

/** A native modal <dialog>: focus trapping, Escape and the backdrop come from the browser. */
export function Dialog({ open, title, onClose, onDismiss, children }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (!open) {
      if (dialog.open) dialog.close();
      return;
    }
    if (!dialog.open) dialog.showModal();
    // the browser focuses the first control, the header's Close: start in the first field instead,
    // once the body has one (a form may arrive after its data)
    if (focusFirstField(dialog)) return;
    const observer = new MutationObserver(() => {
      if (focusFirstField(dialog)) observer.disconnect();
    });
    observer.observe(dialog, { childList: true, subtree: true });
    return () => observer.disconnect();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onCancel={(e) => {
        if (!onDismiss) return;
        e.preventDefault();
        onDismiss();
      }}
      onClose={() => {
        // the browser closes on a second Escape whatever the page says: still the owner's call
        if (onDismiss && open && ref.current && !ref.current.open) {
          ref.current.showModal();
          return onDismiss();
        }
        onClose();
      }}
      className="m-auto w-full max-w-lg rounded-lg border border-surface-line bg-surface-panel p-0 text-text shadow-xl backdrop:bg-ink-950/60"
    >
      <div className="flex items-center justify-between border-b border-surface-line px-5 py-3">
        <h2 id={titleId} className="text-base font-semibold text-text-strong">
          {title}
        </h2>
        <Button variant="ghost" size="sm" onClick={onDismiss ?? onClose} aria-label="Close">
          ✕
        </Button>
      </div>
      <div className="px-5 py-4" data-dialog-body>
        {open && children}
      </div>
    </dialog>
  );
}

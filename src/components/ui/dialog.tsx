import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button';

interface DialogProps {
  open: boolean;
  title: string;
  onClose: () => void;
  children: ReactNode;
}

/** A native modal <dialog>: focus trapping, Escape and the backdrop come from the browser. */
export function Dialog({ open, title, onClose, children }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      className="m-auto w-full max-w-lg rounded-lg border border-surface-line bg-surface-panel p-0 text-text shadow-xl backdrop:bg-ink-950/60"
    >
      <div className="flex items-center justify-between border-b border-surface-line px-5 py-3">
        <h2 id={titleId} className="text-base font-semibold text-text-strong">
          {title}
        </h2>
        <Button variant="ghost" size="sm" onClick={onClose} aria-label="Close">
          ✕
        </Button>
      </div>
      <div className="px-5 py-4">{open && children}</div>
    </dialog>
  );
}

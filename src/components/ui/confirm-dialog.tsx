import type { ReactNode } from 'react';
import { Button } from './button';
import { Dialog } from './dialog';

interface ConfirmDialogProps {
  open: boolean;
  title: string;
  /** what will happen, and anything the server answered (a refusal, say) */
  children: ReactNode;
  confirmLabel: string;
  /** a destructive action is red */
  tone?: 'danger' | 'primary';
  isLoading?: boolean;
  /** leave the confirm button off (the server refused: only Cancel is left) */
  canConfirm?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
  cancelLabel?: string;
}

/** Asks before an action that cannot be undone; Cancel (or Escape) leaves everything as it was. */
export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  tone = 'danger',
  isLoading = false,
  canConfirm = true,
  onConfirm,
  onCancel,
  cancelLabel = 'Cancel',
}: ConfirmDialogProps) {
  return (
    <Dialog open={open} title={title} onClose={onCancel}>
      <div className="space-y-3 text-sm">{children}</div>
      <div className="mt-4 flex flex-wrap justify-end gap-2">
        <Button variant="secondary" onClick={onCancel} autoFocus>
          {cancelLabel}
        </Button>
        {canConfirm && (
          <Button variant={tone} isLoading={isLoading} onClick={onConfirm}>
            {confirmLabel}
          </Button>
        )}
      </div>
    </Dialog>
  );
}

import { useEffect } from 'react';
import { useBlocker } from 'react-router-dom';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';

/**
 * Asks before leaving a page that holds edits not saved: another screen of the app (the router's
 * blocker) or the browser's own leave (closing, reloading, typing an address: `beforeunload`).
 */
export function LeaveGuard({ when, reason }: { when: boolean; reason: string }) {
  const blocker = useBlocker(
    ({ currentLocation, nextLocation }) => when && currentLocation.pathname !== nextLocation.pathname,
  );
  useEffect(() => {
    if (!when) return;
    const ask = (event: BeforeUnloadEvent) => {
      event.preventDefault();
      // older browsers show the dialog only when a value is set
      event.returnValue = '';
    };
    window.addEventListener('beforeunload', ask);
    return () => window.removeEventListener('beforeunload', ask);
  }, [when]);
  // the edits were saved (or dropped) while asking: nothing is left to ask about
  useEffect(() => {
    if (blocker.state === 'blocked' && !when) blocker.proceed();
  }, [blocker, when]);
  return (
    <ConfirmDialog
      open={blocker.state === 'blocked'}
      title="Leave without saving?"
      confirmLabel="Leave and drop the edits"
      cancelLabel="Stay on this page"
      onCancel={() => blocker.reset?.()}
      onConfirm={() => blocker.proceed?.()}
    >
      <p>{reason}</p>
    </ConfirmDialog>
  );
}

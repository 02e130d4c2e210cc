import { useEffect, useRef, useState } from 'react';
import { useBlocker } from 'react-router-dom';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';

interface LeaveGuardProps {
  /** the page holds edits that leaving would drop */
  when: boolean;
  reason: string;
  /**
   * Tries to keep the edits as the page is left (sends the save, which outlives the page); true when
   * it did, so nothing is asked. Without it, or when it cannot, leaving asks first.
   */
  keep?: () => boolean;
  /** a save is on its way: leaving waits for it, and asks only if it fails */
  busy?: boolean;
}

/**
 * Asks before leaving a page that holds edits not saved: another screen of the app (the router's
 * blocker) or the browser's own leave (closing, reloading, typing an address: `beforeunload`).
 * A page that can save as it goes (`keep`) saves instead of asking.
 */
export function LeaveGuard({ when, reason, keep, busy = false }: LeaveGuardProps) {
  const keepRef = useRef(keep);
  useEffect(() => {
    keepRef.current = keep;
  });
  // a save sent as the app's own leave was blocked: wait for it, ask only if it fails
  const [keeping, setKeeping] = useState(false);
  const blocker = useBlocker(({ currentLocation, nextLocation }) => {
    if (!when || currentLocation.pathname === nextLocation.pathname) return false;
    if (busy || keepRef.current?.()) setKeeping(true);
    return true;
  });
  const [wasBusy, setWasBusy] = useState(busy);
  if (busy !== wasBusy) {
    setWasBusy(busy);
    if (!busy && keeping) setKeeping(false);
  }

  useEffect(() => {
    if (!when) return;
    const ask = (event: BeforeUnloadEvent) => {
      if (keepRef.current?.()) return;
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
      open={blocker.state === 'blocked' && when && !keeping}
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

import { useId, useLayoutEffect, useRef, useState, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { focusRing } from '../ui/button';

/** Below this a workspace scrolls with the page rather than squeezing the 3D view further. */
const MIN_HEIGHT_PX = 480;
const BOTTOM_GAP_PX = 12;

/**
 * Keeps an element's height at what the window leaves below its top edge, so a 3D workspace fills
 * the screen and its own controls stay in view without the page scrolling.
 */
function useFillHeight() {
  const ref = useRef<HTMLDivElement>(null);
  useLayoutEffect(() => {
    const el = ref.current;
    if (!el) return;
    const fit = () => {
      const top = el.getBoundingClientRect().top + window.scrollY;
      el.style.height = `${Math.max(MIN_HEIGHT_PX, window.innerHeight - top - BOTTOM_GAP_PX)}px`;
    };
    fit();
    window.addEventListener('resize', fit);
    // the header above may wrap differently once fonts and data arrive
    const observer = new ResizeObserver(fit);
    if (el.parentElement) observer.observe(el.parentElement);
    return () => {
      window.removeEventListener('resize', fit);
      observer.disconnect();
    };
  }, []);
  return ref;
}

/**
 * A side panel of a workspace that folds to a narrow rail with one button, giving its width back to
 * the 3D view.
 */
export function SidePanel({
  title,
  side,
  open,
  onOpenChange,
  className,
  children,
}: {
  title: string;
  side: 'left' | 'right';
  open: boolean;
  onOpenChange: (open: boolean) => void;
  className?: string;
  children: ReactNode;
}) {
  const id = useId();
  const arrow = (side === 'right') === open ? '›' : '‹';
  const toggle = (
    <button
      type="button"
      aria-expanded={open}
      aria-controls={id}
      aria-label={open ? `Hide ${title.toLowerCase()}` : `Show ${title.toLowerCase()}`}
      title={open ? `Hide ${title.toLowerCase()}` : `Show ${title.toLowerCase()}`}
      onClick={() => onOpenChange(!open)}
      className={cn(
        'inline-flex size-7 shrink-0 items-center justify-center rounded-md text-lg leading-none text-text-muted hover:bg-surface-sunken hover:text-text-strong',
        focusRing,
      )}
    >
      <span aria-hidden="true">{arrow}</span>
    </button>
  );
  if (!open)
    return (
      <div className="flex w-10 shrink-0 flex-col items-center gap-2 rounded-lg border border-surface-line bg-surface-panel py-2">
        {toggle}
        <span
          aria-hidden="true"
          className="text-xs font-semibold tracking-wide text-text-muted uppercase [writing-mode:vertical-rl]"
        >
          {title}
        </span>
      </div>
    );
  return (
    <section
      id={id}
      aria-label={title}
      className={cn(
        'flex min-h-0 shrink-0 flex-col rounded-lg border border-surface-line bg-surface-panel',
        className,
      )}
    >
      <div className="flex items-center justify-between gap-2 border-b border-surface-line py-1 pr-1 pl-3">
        <h2 className="text-xs font-semibold tracking-wide text-text-muted uppercase">{title}</h2>
        {toggle}
      </div>
      {children}
    </section>
  );
}

/** Whether a side panel starts open: folded where the window is too narrow for it and a 3D view. */
export function useSidePanelState(minWindowPx: number) {
  return useState(() => typeof window === 'undefined' || window.innerWidth >= minWindowPx);
}

/**
 * A 3D workspace: the view in the middle takes what the window gives, side panels beside it, the
 * whole filling the window below the page header.
 */
export function Workspace({
  left,
  right,
  children,
  className,
}: {
  left?: ReactNode;
  right?: ReactNode;
  children: ReactNode;
  className?: string;
}) {
  const ref = useFillHeight();
  return (
    <div ref={ref} className={cn('flex min-h-0 gap-3', className)}>
      {left}
      <div className="flex min-h-0 min-w-0 flex-1 flex-col gap-2">{children}</div>
      {right}
    </div>
  );
}

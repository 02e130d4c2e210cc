import type { HTMLAttributes, ReactNode, Ref, TdHTMLAttributes, ThHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

interface TableProps extends HTMLAttributes<HTMLDivElement> {
  caption: string;
  children: ReactNode;
  /** the rows in all (the header's included), where only some are in the page: a virtualized table */
  rowCount?: number;
  /** the box around the table, which scrolls it sideways (and down, given a height) */
  ref?: Ref<HTMLDivElement>;
}

export function Table({ caption, children, rowCount, className, ref, ...props }: TableProps) {
  return (
    <div ref={ref} className={cn('overflow-x-auto', className)} {...props}>
      <table className="w-full border-collapse text-left text-sm" aria-rowcount={rowCount}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ className, ...props }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={cn(
        'border-b border-surface-line px-3 py-2 text-xs font-semibold tracking-wide text-text-muted uppercase',
        className,
      )}
      {...props}
    />
  );
}

export function Td({ className, ...props }: TdHTMLAttributes<HTMLTableCellElement>) {
  return (
    <td className={cn('border-b border-surface-line/70 px-3 py-2.5 align-middle', className)} {...props} />
  );
}

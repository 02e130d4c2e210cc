import type { InputHTMLAttributes, Ref } from 'react';
import { cn } from '@/lib/cn';

export const controlClass =
  'block w-full rounded-md border border-surface-line bg-surface-panel px-3 text-sm text-text-strong placeholder:text-text-muted focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-accent aria-[invalid=true]:border-danger disabled:bg-surface-sunken';

export interface InputProps extends InputHTMLAttributes<HTMLInputElement> {
  ref?: Ref<HTMLInputElement>;
}

export function Input({ className, ref, ...props }: InputProps) {
  return <input ref={ref} className={cn(controlClass, 'h-10', className)} {...props} />;
}

import type { Ref, SelectHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';
import { controlClass } from './input';

export interface SelectOption {
  value: string;
  label: string;
}

export interface SelectProps extends SelectHTMLAttributes<HTMLSelectElement> {
  options: readonly SelectOption[];
  ref?: Ref<HTMLSelectElement>;
}

export function Select({ options, className, ref, ...props }: SelectProps) {
  return (
    <select ref={ref} className={cn(controlClass, 'h-10 pr-8', className)} {...props}>
      {options.map((option) => (
        <option key={option.value} value={option.value}>
          {option.label}
        </option>
      ))}
    </select>
  );
}

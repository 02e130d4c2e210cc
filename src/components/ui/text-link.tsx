import { Link, type LinkProps } from 'react-router-dom';
import { cn } from '@/lib/cn';

export function TextLink({ className, ...props }: LinkProps) {
  return (
    <Link
      className={cn(
        'inline-block rounded-sm text-sm font-medium text-accent underline underline-offset-2 hover:text-accent-strong focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent',
        className,
      )}
      {...props}
    />
  );
}

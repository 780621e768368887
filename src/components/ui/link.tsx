import { Link, type LinkProps } from 'react-router';
import { cn } from '@/lib/cn';

/** An in-app text link. Targets come from `paths`, never hand-written strings. */
export function TextLink({ className, ...props }: LinkProps) {
  return (
    <Link
      className={cn('focus-ring rounded-sm font-semibold text-spruce-700 underline decoration-spruce-300 underline-offset-4 hover:text-spruce-900 hover:decoration-copper-500', className)}
      {...props}
    />
  );
}

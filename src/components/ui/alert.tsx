import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

const tones = {
  info: 'border-slate-line bg-slate-bg text-slate-text',
  success: 'border-moss-line bg-moss-bg text-moss-text',
  warning: 'border-ochre-line bg-ochre-bg text-ochre-text',
  danger: 'border-brick-line bg-brick-bg text-brick-text',
} as const;

/**
 * An inline message box. `live` makes screen readers announce it when it appears:
 * "assertive" for errors (role=alert), "polite" for confirmations (role=status).
 */
export function Alert({
  tone = 'info',
  title,
  children,
  live,
  className,
}: {
  tone?: keyof typeof tones;
  title?: ReactNode;
  children?: ReactNode;
  live?: 'assertive' | 'polite';
  className?: string;
}) {
  const role = live === 'assertive' ? 'alert' : live === 'polite' ? 'status' : undefined;
  return (
    <div role={role} className={cn('rounded-control border px-4 py-3 text-sm', tones[tone], className)}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className={title ? 'mt-1' : undefined}>{children}</div> : null}
    </div>
  );
}

import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

const tones = {
  neutral: 'border-ink-line bg-paper-sunken text-ink',
  brand: 'border-spruce-200 bg-spruce-50 text-spruce-800',
  success: 'border-moss-line bg-moss-bg text-moss-text',
  warning: 'border-ochre-line bg-ochre-bg text-ochre-text',
  danger: 'border-brick-line bg-brick-bg text-brick-text',
  info: 'border-slate-line bg-slate-bg text-slate-text',
} as const;

const dots: Record<BadgeTone, string> = {
  neutral: 'bg-ink-faint',
  brand: 'bg-spruce-500',
  success: 'bg-moss-text',
  warning: 'bg-copper-500',
  danger: 'bg-brick-solid',
  info: 'bg-slate-text',
};

export type BadgeTone = keyof typeof tones;

/**
 * A status chip. The words carry the meaning; the colour only repeats it, so `children`
 * must always say the state ("In transit", "Invited").
 */
export function Badge({ tone = 'neutral', children, className }: { tone?: BadgeTone; children: ReactNode; className?: string }) {
  return (
    <span className={cn('inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-xs font-semibold whitespace-nowrap', tones[tone], className)}>
      <span aria-hidden="true" className={cn('size-1.5 rounded-full', dots[tone])} />
      {children}
    </span>
  );
}

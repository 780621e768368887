import { cn } from '@/lib/cn';

/** Our mark: a platter with its spindle, and a copper postmark notch on the rim. */
export function LogoMark({ className }: { className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 32 32" className={cn('size-8', className)} fill="none">
      <circle cx="16" cy="16" r="12" stroke="currentColor" strokeWidth="2.5" />
      <circle cx="16" cy="16" r="6.5" stroke="currentColor" strokeWidth="1.5" strokeOpacity="0.7" />
      <circle cx="16" cy="16" r="2" className="fill-copper-400" />
      <path d="M23.5 4.2 29.5 2l-2.1 6z" className="fill-copper-400" />
    </svg>
  );
}

export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={cn('inline-flex items-center gap-2.5', className)}>
      <LogoMark />
      <span className="text-lg font-bold tracking-tight">
        Platter<span className="text-copper-300">post</span>
      </span>
    </span>
  );
}

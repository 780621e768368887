import { cn } from '@/lib/cn';

const sizes = { sm: 'size-4', md: 'size-6', lg: 'size-10' } as const;

/** A spinning platter. With `label`, announces itself; without, it is decoration next to text. */
export function Spinner({ size = 'md', label, className }: { size?: keyof typeof sizes; label?: string; className?: string }) {
  const svg = (
    <svg aria-hidden="true" viewBox="0 0 24 24" className={cn('animate-spin', sizes[size], className)} fill="none">
      <circle cx="12" cy="12" r="9" stroke="currentColor" strokeOpacity="0.2" strokeWidth="3" />
      <path d="M21 12a9 9 0 0 0-9-9" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
    </svg>
  );
  if (!label) return svg;
  return (
    <span role="status" className="inline-flex items-center gap-2">
      {svg}
      <span className="sr-only">{label}</span>
    </span>
  );
}

export function PageSpinner({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex min-h-[40vh] items-center justify-center text-spruce-600">
      <Spinner size="lg" label={label} />
    </div>
  );
}

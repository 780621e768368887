import type { ReactNode } from 'react';

/**
 * The page's one h1, and the browser tab title (React hoists <title> into <head>).
 */
export function PageHeader({ title, description, actions, eyebrow }: { title: string; description?: ReactNode; actions?: ReactNode; eyebrow?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <title>{`${title} · Platterpost`}</title>
      <div className="min-w-0">
        {eyebrow ? <p className="text-sm font-semibold text-copper-600">{eyebrow}</p> : null}
        <h1 className="text-2xl font-bold tracking-tight text-ink-strong sm:text-3xl">{title}</h1>
        {description ? <p className="mt-1.5 max-w-2xl text-ink-muted">{description}</p> : null}
      </div>
      {actions ? <div className="flex shrink-0 items-center gap-2">{actions}</div> : null}
    </div>
  );
}

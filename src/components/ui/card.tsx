import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

export interface CardProps {
  title?: ReactNode;
  description?: ReactNode;
  /** Buttons or links shown beside the title. */
  actions?: ReactNode;
  /** The heading level that fits the page outline; pages use h1 for their own title. */
  headingLevel?: 2 | 3;
  className?: string;
  children?: ReactNode;
}

export function Card({ title, description, actions, headingLevel = 2, className, children }: CardProps) {
  const Heading = headingLevel === 2 ? 'h2' : 'h3';
  return (
    <section className={cn('rounded-panel border border-ink-hairline bg-paper-raised shadow-panel', className)}>
      {title || actions ? (
        <div className="flex flex-wrap items-start justify-between gap-3 border-b border-ink-hairline px-5 py-4">
          <div className="min-w-0">
            {title ? <Heading className="text-base font-semibold text-ink-strong">{title}</Heading> : null}
            {description ? <p className="mt-0.5 text-sm text-ink-muted">{description}</p> : null}
          </div>
          {actions ? <div className="flex shrink-0 items-center gap-2">{actions}</div> : null}
        </div>
      ) : null}
      <div className="px-5 py-4">{children}</div>
    </section>
  );
}

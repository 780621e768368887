import type { ReactNode } from 'react';
import { Wordmark } from '@/components/brand/wordmark';

/** A whole-screen message for when there is no portal around us (start-up, crashes, 404). */
export function FullPageMessage({ title, children, actions }: { title: string; children: ReactNode; actions?: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="bg-spruce-900 px-6 py-4 text-paper">
        <Wordmark />
      </header>
      <main id="main" className="flex flex-1 items-center justify-center px-6 py-12">
        <title>{`${title} · Platterpost`}</title>
        <div className="max-w-lg text-center">
          <h1 className="text-2xl font-bold tracking-tight text-ink-strong">{title}</h1>
          <div className="mt-3 text-ink-muted">{children}</div>
          {actions ? <div className="mt-6 flex flex-wrap justify-center gap-3">{actions}</div> : null}
        </div>
      </main>
    </div>
  );
}

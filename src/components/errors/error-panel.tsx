import type { ReactNode } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';

/** What a panel shows when only it failed; the page around it keeps working. */
export function PanelError({ title = 'This part of the page could not be shown', onRetry, children }: { title?: string; onRetry?: () => void; children?: ReactNode }) {
  return (
    <Alert tone="danger" title={title}>
      <div className="flex flex-wrap items-center gap-3">
        <span>{children ?? 'Try again in a moment. If it keeps happening, tell the network team.'}</span>
        {onRetry ? (
          <Button size="sm" variant="secondary" onClick={onRetry}>
            Try again
          </Button>
        ) : null}
      </div>
    </Alert>
  );
}

import { useState, type ReactNode } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { ErrorBoundary } from '@/components/errors/error-boundary';
import { FullPageMessage } from '@/components/errors/full-page-message';
import { Button } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { ToastProvider } from '@/components/ui/toast';
import { AuthProvider } from '@/lib/auth';
import { authKeys } from '@/lib/query-keys';
import { createQueryClient } from '@/lib/react-query';
import { sessionQueryDefaults } from '@/features/auth/api/get-me';

function CrashPage() {
  return (
    <FullPageMessage title="Something went wrong" actions={<Button onClick={() => window.location.reload()}>Reload</Button>}>
      Platterpost hit a problem it could not recover from. Reload the page to carry on.
    </FullPageMessage>
  );
}

function SessionUnavailable({ retry }: { retry: () => void }) {
  return (
    <FullPageMessage title="We could not reach Platterpost" actions={<Button onClick={retry}>Try again</Button>}>
      Your connection or our service is having trouble. Nothing is lost; try again in a moment.
    </FullPageMessage>
  );
}

/** Error boundary → QueryClientProvider → toasts → session. */
export function AppProvider({ children }: { children: ReactNode }) {
  const [queryClient] = useState(() => {
    const client = createQueryClient();
    // The session query's function lives in the auth feature; the session hooks in lib read it by key.
    client.setQueryDefaults(authKeys.me, sessionQueryDefaults);
    return client;
  });

  return (
    <ErrorBoundary fallback={() => <CrashPage />}>
      <QueryClientProvider client={queryClient}>
        <ToastProvider>
          <AuthProvider loading={<PageSpinner label="Opening Platterpost…" />} failed={(retry) => <SessionUnavailable retry={retry} />}>
            {children}
          </AuthProvider>
        </ToastProvider>
      </QueryClientProvider>
    </ErrorBoundary>
  );
}

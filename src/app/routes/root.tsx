import { useEffect, useRef } from 'react';
import { Outlet, ScrollRestoration, useLocation, useNavigation } from 'react-router';

/** A thin copper bar while the next page's code or data is loading. */
function NavigationProgress() {
  const navigation = useNavigation();
  if (navigation.state === 'idle') return null;
  return (
    <div role="progressbar" aria-label="Loading the page" className="fixed inset-x-0 top-0 z-50 h-1 overflow-hidden bg-copper-100">
      <div className="animate-progress h-full w-2/5 bg-copper-500" />
    </div>
  );
}

/**
 * After a client-side page change, move focus to the new page's main region so that
 * keyboard and screen-reader users start at the top of the new content.
 */
function FocusOnNavigate() {
  const { pathname } = useLocation();
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    document.getElementById('main')?.focus({ preventScroll: true });
  }, [pathname]);
  return null;
}

export default function RootLayout() {
  return (
    <>
      <NavigationProgress />
      <FocusOnNavigate />
      <ScrollRestoration />
      <Outlet />
    </>
  );
}

import type { ReactNode } from 'react';
import { Link, NavLink, Outlet, useNavigate } from 'react-router';
import type { Permission } from '@shared/permissions';
import { roleLabels } from '@shared/vocabulary';
import { Wordmark } from '@/components/brand/wordmark';
import { Button } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { useUser, useCan } from '@/lib/auth';
import { homePathFor } from '@/lib/authorization';
import { cn } from '@/lib/cn';
import { useSignOut } from '@/features/auth/api/sign-out';

export interface NavItem {
  label: string;
  href: string;
  /** Hidden from people without it; the page's own guard enforces the same rule. */
  permission?: Permission;
}

export interface NavGroup {
  label: string;
  items: NavItem[];
}

export type NavEntry = NavItem | NavGroup;

function isGroup(entry: NavEntry): entry is NavGroup {
  return 'items' in entry;
}

function SkipLink() {
  return (
    <a
      href="#main"
      className="sr-only z-50 rounded-control bg-paper-raised px-4 py-2 font-semibold text-spruce-800 shadow-lift focus:not-sr-only focus:fixed focus:top-3 focus:left-3"
    >
      Skip to main content
    </a>
  );
}

function NavItemLink({ item }: { item: NavItem }) {
  return (
    <NavLink
      to={item.href}
      end
      className={({ isActive }) =>
        cn(
          'focus-ring flex items-center rounded-control px-3 py-2 text-sm font-medium whitespace-nowrap transition-colors',
          isActive ? 'bg-spruce-100 font-semibold text-spruce-800 shadow-[inset_3px_0_0] shadow-copper-500' : 'text-ink-muted hover:bg-paper-sunken hover:text-ink-strong',
        )
      }
    >
      {item.label}
    </NavLink>
  );
}

function PortalNav({ label, entries }: { label: string; entries: NavEntry[] }) {
  const can = useCan();
  const visible = (item: NavItem) => !item.permission || can(item.permission);
  const shown = entries
    .map((entry) => (isGroup(entry) ? { ...entry, items: entry.items.filter(visible) } : entry))
    .filter((entry) => (isGroup(entry) ? entry.items.length > 0 : visible(entry)));

  return (
    <nav aria-label={label} className="border-b border-ink-hairline bg-paper-raised md:w-60 md:shrink-0 md:border-r md:border-b-0 md:bg-transparent">
      <ul className="flex gap-1 overflow-x-auto px-3 py-2 md:sticky md:top-0 md:flex-col md:overflow-visible md:px-4 md:py-6">
        {shown.map((entry) =>
          isGroup(entry) ? (
            <li key={entry.label} className="flex gap-1 md:mt-4 md:flex-col">
              <span id={`nav-group-${entry.label}`} className="hidden px-3 pb-1 text-xs font-semibold tracking-wide text-ink-muted uppercase md:block">
                {entry.label}
              </span>
              <ul aria-labelledby={`nav-group-${entry.label}`} className="flex gap-1 md:flex-col">
                {entry.items.map((item) => (
                  <li key={item.href}>
                    <NavItemLink item={item} />
                  </li>
                ))}
              </ul>
            </li>
          ) : (
            <li key={entry.href}>
              <NavItemLink item={entry} />
            </li>
          ),
        )}
      </ul>
    </nav>
  );
}

function SignOutButton() {
  const signOut = useSignOut();
  const navigate = useNavigate();
  return (
    <Button
      variant="inverse"
      size="sm"
      isLoading={signOut.isPending}
      onClick={() =>
        signOut.mutate(undefined, {
          onSettled: () => void navigate(paths.auth.signIn.getHref(), { replace: true }),
        })
      }
    >
      Sign out
    </Button>
  );
}

/**
 * The frame shared by the three portals: header (wordmark, organisation, the person and
 * their role, sign-out), the portal's navigation, and the page.
 */
export function PortalShell({ portalName, navLabel, nav, children }: { portalName: string; navLabel: string; nav: NavEntry[]; children?: ReactNode }) {
  const user = useUser();
  return (
    <div className="flex min-h-screen flex-col">
      <SkipLink />
      <header className="bg-spruce-900 text-paper">
        <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-5 gap-y-2 px-4 py-3 sm:px-6">
          <Link to={homePathFor(user.role)} className="focus-ring rounded-control text-paper" aria-label="Platterpost, go to your home page">
            <Wordmark />
          </Link>
          <div className="flex min-w-0 items-center gap-3 border-l border-spruce-700 pl-5">
            <div className="min-w-0">
              <p className="truncate text-sm font-semibold">{user.organization.name}</p>
              <p className="text-xs text-spruce-200">{portalName}</p>
            </div>
          </div>
          <div className="ml-auto flex items-center gap-3">
            <Link to={paths.profile.getHref()} className="focus-ring rounded-control px-2 py-1 text-right hover:bg-spruce-800">
              <span className="block text-sm font-semibold">{user.name}</span>
              <span className="block text-xs text-spruce-200">{roleLabels[user.role]}</span>
            </Link>
            <SignOutButton />
          </div>
        </div>
      </header>
      <div className="mx-auto flex w-full max-w-page flex-1 flex-col md:flex-row">
        <PortalNav label={navLabel} entries={nav} />
        <main id="main" tabIndex={-1} className="min-w-0 flex-1 px-4 py-6 outline-none sm:px-6 md:py-8">
          {children ?? <Outlet />}
        </main>
      </div>
    </div>
  );
}

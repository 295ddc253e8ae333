// The signed-in frame: header with navigation allowed by the user's roles, the page, the safety footer.
import { Suspense, useEffect, useState } from 'react';
import { Link, NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router';
import { can, ROLE_LABELS } from '@/shared/permissions';
import { NAV } from '@/app/nav';
import { useLogout, useMe } from '@/lib/auth';
import { paths } from '@/lib/paths';
import { Icon, Wordmark } from '@/components/ui/icons';
import { LoadingBlock, Toaster } from '@/components/ui/feedback';
import { lazyPage } from '@/app/lazy-page';
import { useOnline } from '@/lib/use-online';
import { useAfterFirstView } from '@/lib/use-after-first-view';
import { listenForEarlySearch } from '@/lib/search-shortcut';

// The search box and its results list load once the page's first view is up, keeping them out of
// every page's first download; the placeholder holds its place so the header does not shift.
const HeaderSearch = lazyPage(() => import('@/features/search/components/header-search'), 'HeaderSearch');

// Holds the search box's place until it has loaded, so the header does not shift.
const SEARCH_PLACEHOLDER = <div className="min-h-11 min-w-0 flex-1 md:w-11 md:flex-none" />;

// More entries than this go under "More" so the header fits a laptop screen.
const INLINE_ITEMS = 5;

export function AppLayout() {
  const { data: me, isPending } = useMe();
  const location = useLocation();
  const navigate = useNavigate();
  const logout = useLogout();
  const [menuOpen, setMenuOpen] = useState(false);
  const online = useOnline();
  const afterFirstView = useAfterFirstView();
  // "/" before the search box has loaded loads it at once; what follows is handed over.
  const [searchWanted, setSearchWanted] = useState(false);
  const showSearch = afterFirstView || searchWanted;
  const canSearch = Boolean(me && can(me.user.roles, 'search:use'));
  useEffect(() => (canSearch ? listenForEarlySearch(() => setSearchWanted(true)) : undefined), [canSearch]);
  useEffect(() => setMenuOpen(false), [location.pathname]);

  if (isPending) {
    return (
      <div className="mx-auto max-w-5xl p-6">
        <LoadingBlock label="Loading your account" />
      </div>
    );
  }
  if (!me) return <Navigate to={`${paths.signIn}?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;

  const items = NAV.filter((i) => !i.permission || can(me.user.roles, i.permission));
  const link = ({ isActive }: { isActive: boolean }) =>
    `flex min-h-11 items-center gap-2 whitespace-nowrap rounded-md px-3 font-semibold ${isActive ? 'bg-amber-wash text-amber-deep' : 'text-ink hover:bg-paper-sunk'}`;

  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-paper-raised focus:p-2">
        Skip to content
      </a>
      <header className="sticky top-0 z-30 border-b border-rule bg-paper/95 backdrop-blur">
        <div className="mx-auto flex max-w-6xl items-center gap-2 px-4 py-2 md:gap-3">
          <Link to={paths.home} className="inline-flex min-h-11 items-center text-ink" aria-label="Beadpath home">
            <Wordmark />
          </Link>
          <nav aria-label="Main" className="ml-4 hidden flex-1 items-center gap-1 md:flex">
            {items.slice(0, INLINE_ITEMS).map((i) => (
              <NavLink key={i.to} to={i.to} end={i.to === '/'} className={link}>
                <i.icon />
                {i.label}
              </NavLink>
            ))}
            {items.length > INLINE_ITEMS ? (
              <details className="relative">
                <summary className="flex min-h-11 cursor-pointer list-none items-center whitespace-nowrap rounded-md px-3 font-semibold text-ink hover:bg-paper-sunk">More ▾</summary>
                <div className="absolute left-0 z-40 mt-1 w-56 rounded-md border border-rule bg-paper-raised p-1 shadow-lg">
                  {items.slice(INLINE_ITEMS).map((i) => (
                    <NavLink key={i.to} to={i.to} className={link} onClick={(e) => e.currentTarget.closest('details')?.removeAttribute('open')}>
                      <i.icon />
                      {i.label}
                    </NavLink>
                  ))}
                </div>
              </details>
            ) : null}
          </nav>
          {canSearch ? (
            showSearch ? (
              <Suspense fallback={SEARCH_PLACEHOLDER}>
                <HeaderSearch />
              </Suspense>
            ) : (
              SEARCH_PLACEHOLDER
            )
          ) : null}
          <div className="ml-auto hidden items-center gap-2 md:flex">
            <NavLink to={paths.account} className={link}>
              <Icon.account />
              <span className="hidden max-w-40 truncate xl:inline">{me.user.name}</span>
              <span className="sr-only xl:hidden">Account</span>
            </NavLink>
            <button
              type="button"
              className="min-h-11 whitespace-nowrap rounded-md px-3 font-semibold text-ink-soft hover:bg-paper-sunk"
              onClick={() => logout.mutate(undefined, { onSuccess: () => navigate(paths.signIn) })}
            >
              Sign out
            </button>
          </div>
          <button
            type="button"
            className="ml-auto inline-flex min-h-11 min-w-11 items-center justify-center gap-2 rounded-md border border-rule-strong px-3 font-semibold md:hidden"
            aria-expanded={menuOpen}
            aria-controls="phone-menu"
            onClick={() => setMenuOpen((o) => !o)}
          >
            {menuOpen ? <Icon.close /> : <Icon.menu />}
            Menu
          </button>
        </div>
        {menuOpen ? (
          <nav id="phone-menu" aria-label="Main" className="border-t border-rule bg-paper-raised px-4 py-3 md:hidden">
            <ul className="space-y-1">
              {items.map((i) => (
                <li key={i.to}>
                  <NavLink to={i.to} end={i.to === '/'} className={link}>
                    <i.icon />
                    {i.label}
                  </NavLink>
                </li>
              ))}
              <li>
                <NavLink to={paths.account} className={link}>
                  <Icon.account />
                  Account ({me.user.name})
                </NavLink>
              </li>
              <li>
                <button
                  type="button"
                  className="flex min-h-11 w-full items-center rounded-md px-3 font-semibold text-ink-soft"
                  onClick={() => logout.mutate(undefined, { onSuccess: () => navigate(paths.signIn) })}
                >
                  Sign out
                </button>
              </li>
            </ul>
          </nav>
        ) : null}
      </header>
      {online ? null : (
        <p role="status" className="border-b border-amber-line bg-amber-wash px-4 py-2 text-center text-sm font-semibold text-amber-deep">
          No connection — walks keep your answers on this phone
        </p>
      )}
      {/* At least a screen tall, so the footer starts below the fold and is not pushed down (a
          layout shift) when the page's content arrives. */}
      <main id="main" className="mx-auto min-h-dvh w-full max-w-6xl flex-1 px-4 py-6">
        {/* Pages load on first visit; the skeleton holds their place inside the frame. */}
        <Suspense fallback={<LoadingBlock label="Loading the page" />}>
          <Outlet />
        </Suspense>
      </main>
      <footer className="border-t border-rule bg-paper-sunk px-4 py-4 text-sm text-ink-soft">
        <p className="mx-auto max-w-6xl">
          Beadpath guides and calculators support trained people; they do not replace them. Before servicing a valve, follow local codes, your site&rsquo;s rules, the equipment maker&rsquo;s manual
          and the fluid&rsquo;s safety data sheet: lock out and tag out every energy source and relieve air and fluid pressure first. Signed in as {me.user.email} ·{' '}
          {me.user.roles.map((r) => ROLE_LABELS[r]).join(', ')} · {me.user.organisationName} ·{' '}
          <Link to={paths.help} className="font-semibold text-amber-deep underline">
            Help and keyboard shortcuts
          </Link>
        </p>
      </footer>
      <Toaster />
    </div>
  );
}

import { useEffect, useRef, useState } from 'react';
import { Link, NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { KeyRound, LogOut, Menu, X } from 'lucide-react';
import { can } from '@shared/policies';
import { ROLE_LABELS } from '@shared/schemas/roles';
import { useSession, useSignOut } from '@/lib/session';
import { BrandMark } from '@/components/BrandMark';
import { NotificationBell } from '@/components/NotificationBell';
import { NAVIGATION } from './navigation';
import { ScanBox } from './ScanBox';

const MAIN_ID = 'main-content';

/**
 * The signed-in frame. From 900 px up the side bar stands beside the page; below, it is a menu that
 * the top bar's button opens over the page (Escape, a link or a click beside it close it, and the
 * focus goes back to the button).
 */
export function AppLayout() {
  const session = useSession();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const location = useLocation();
  const [menuOpen, setMenuOpen] = useState(false);
  const menuButton = useRef<HTMLButtonElement>(null);
  const sideBar = useRef<HTMLElement>(null);

  const closeMenu = () => {
    setMenuOpen(false);
    menuButton.current?.focus();
  };

  useEffect(() => {
    if (!menuOpen) return;
    // The focus goes into the menu at the page one is on, where the eye finds the mark.
    const current = sideBar.current?.querySelector<HTMLElement>('[aria-current="page"]') ?? sideBar.current?.querySelector<HTMLElement>('a, button');
    current?.focus();
    const onKey = (event: KeyboardEvent) => {
      if (event.key !== 'Escape') return;
      event.preventDefault();
      setMenuOpen(false);
      menuButton.current?.focus();
    };
    document.addEventListener('keydown', onKey);
    return () => document.removeEventListener('keydown', onKey);
  }, [menuOpen]);

  if (session.isPending) return <div className="p-8 text-ink-muted">Loading…</div>;
  if (!session.data) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;

  const user = session.data;
  const items = NAVIGATION.filter((item) => !item.permission || can(user, item.permission));
  const groups = [
    { id: 'work', label: 'Work' },
    { id: 'admin', label: 'Site' },
  ] as const;
  // A choice in the open menu closes it; on the wide layout there is nothing to close.
  const chose = () => {
    if (menuOpen) closeMenu();
  };

  return (
    <div className="min-h-screen desk:flex">
      <a
        href={`#${MAIN_ID}`}
        className="sr-only rounded bg-frame text-sm font-medium text-white no-underline focus:not-sr-only focus:fixed focus:top-2 focus:left-2 focus:z-50 focus:px-3 focus:py-2 focus:outline-signal"
        onClick={(event) => {
          event.preventDefault();
          document.getElementById(MAIN_ID)?.focus();
        }}
      >
        Skip to main content
      </a>
      {menuOpen && <div className="fixed inset-0 z-30 bg-frame-deep/50 desk:hidden" aria-hidden onClick={closeMenu} />}
      <aside
        id="main-menu"
        ref={sideBar}
        aria-label="Menu"
        className={`${menuOpen ? 'flex' : 'hidden'} fixed inset-y-0 left-0 z-40 w-64 max-w-[85vw] flex-col overflow-y-auto bg-frame text-white/90 shadow-xl desk:static desk:flex desk:w-52 desk:shrink-0 desk:overflow-visible desk:shadow-none`}
        onBlur={(event) => {
          // Tabbing out of the open menu closes it, as the page behind is not the focus's place.
          const next = event.relatedTarget as Node | null;
          if (menuOpen && next && !event.currentTarget.contains(next) && next !== menuButton.current) setMenuOpen(false);
        }}
      >
        <div className="flex items-center justify-between px-4 py-4">
          <BrandMark />
          <button
            type="button"
            className="rounded p-1 text-white/80 hover:bg-frame-line hover:text-white focus-visible:outline-signal desk:hidden"
            aria-label="Close menu"
            onClick={closeMenu}
          >
            <X className="h-5 w-5" aria-hidden />
          </button>
        </div>
        <nav aria-label="Main" className="flex-1 px-2">
          {groups.map((group) => {
            const groupItems = items.filter((item) => item.group === group.id);
            if (groupItems.length === 0) return null;
            return (
              <div key={group.id} className="mb-4">
                <p className="px-2 pb-1 text-2xs font-medium tracking-wider text-white/70 uppercase">{group.label}</p>
                {groupItems.map(({ to, label, icon: Icon }) => (
                  <NavLink
                    key={to}
                    to={to}
                    end={to === '/'}
                    onClick={chose}
                    className={({ isActive }) =>
                      `flex items-center gap-2 rounded px-2 py-1.5 text-sm no-underline focus-visible:outline-signal ${isActive ? 'bg-frame-deep font-medium text-white shadow-[inset_3px_0_0] shadow-signal' : 'text-white/85 hover:bg-frame-line'}`
                    }
                  >
                    <Icon className="h-4 w-4" aria-hidden />
                    {label}
                  </NavLink>
                ))}
              </div>
            );
          })}
        </nav>
        <div className="border-t border-frame-line px-4 py-3 text-xs">
          <p className="font-medium text-white" data-testid="signed-in-user">
            {user.name}
          </p>
          <p className="text-white/75">{user.roles.map((r) => ROLE_LABELS[r]).join(', ')}</p>
          <div className="mt-2 flex flex-col items-start gap-1">
            <Link
              to="/account/password"
              onClick={chose}
              className="inline-flex items-center gap-1 text-white/80 no-underline hover:text-white focus-visible:outline-signal"
            >
              <KeyRound className="h-3.5 w-3.5" aria-hidden /> Change password
            </Link>
            <button
              type="button"
              className="inline-flex items-center gap-1 text-white/80 hover:text-white focus-visible:outline-signal"
              onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate('/sign-in') })}
            >
              <LogOut className="h-3.5 w-3.5" aria-hidden /> Sign out
            </button>
          </div>
        </div>
      </aside>
      <div className="flex min-w-0 flex-1 flex-col">
        <header className="flex items-center gap-2 border-b border-paper-line px-3 py-2 desk:px-6">
          <button
            ref={menuButton}
            type="button"
            className="inline-flex items-center gap-1.5 rounded px-2 py-1.5 text-sm font-medium text-frame hover:bg-paper-sunk desk:hidden"
            aria-expanded={menuOpen}
            aria-controls="main-menu"
            onClick={() => setMenuOpen((open) => !open)}
          >
            <Menu className="h-5 w-5" aria-hidden />
            Menu
          </button>
          {/* Tools every page has: the scan box, the notifications. */}
          <div className="flex min-w-0 flex-1 items-center justify-end gap-2">
            <ScanBox user={user} />
            <NotificationBell />
          </div>
        </header>
        <main id={MAIN_ID} tabIndex={-1} className="min-w-0 flex-1 px-3 py-4 outline-none desk:px-6 desk:py-5">
          <Outlet />
        </main>
      </div>
    </div>
  );
}

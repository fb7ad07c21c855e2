import { Link, NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { KeyRound, LogOut } from 'lucide-react';
import { can } from '@shared/policies';
import { ROLE_LABELS } from '@shared/schemas/roles';
import { useSession, useSignOut } from '@/lib/session';
import { BrandMark } from '@/components/BrandMark';
import { NotificationBell } from '@/components/NotificationBell';
import { NAVIGATION } from './navigation';
import { ScanBox } from './ScanBox';

export function AppLayout() {
  const session = useSession();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const location = useLocation();

  if (session.isPending) return <div className="p-8 text-ink-muted">Loading…</div>;
  if (!session.data) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;

  const user = session.data;
  const items = NAVIGATION.filter((item) => !item.permission || can(user, item.permission));
  const groups = [
    { id: 'work', label: 'Work' },
    { id: 'admin', label: 'Site' },
  ] as const;

  return (
    <div className="flex min-h-screen">
      <aside className="flex w-52 shrink-0 flex-col bg-frame text-white/90">
        <div className="px-4 py-4">
          <BrandMark />
        </div>
        <nav aria-label="Main" className="flex-1 px-2">
          {groups.map((group) => {
            const groupItems = items.filter((item) => item.group === group.id);
            if (groupItems.length === 0) return null;
            return (
              <div key={group.id} className="mb-4">
                <p className="px-2 pb-1 text-2xs font-medium tracking-wider text-white/50 uppercase">{group.label}</p>
                {groupItems.map(({ to, label, icon: Icon }) => (
                  <NavLink
                    key={to}
                    to={to}
                    end={to === '/'}
                    className={({ isActive }) =>
                      `flex items-center gap-2 rounded px-2 py-1.5 text-sm no-underline ${isActive ? 'bg-frame-deep text-white' : 'text-white/80 hover:bg-frame-line'}`
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
          <p className="text-white/60">{user.roles.map((r) => ROLE_LABELS[r]).join(', ')}</p>
          <div className="mt-2 flex flex-col items-start gap-1">
            <Link to="/account/password" className="inline-flex items-center gap-1 text-white/70 no-underline hover:text-white">
              <KeyRound className="h-3.5 w-3.5" aria-hidden /> Change password
            </Link>
            <button
              type="button"
              className="inline-flex items-center gap-1 text-white/70 hover:text-white"
              onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate('/sign-in') })}
            >
              <LogOut className="h-3.5 w-3.5" aria-hidden /> Sign out
            </button>
          </div>
        </div>
      </aside>
      <main className="min-w-0 flex-1 px-6 py-5">
        <header className="mb-3 flex items-center justify-end gap-2">
          <ScanBox user={user} />
          <NotificationBell />
        </header>
        <Outlet />
      </main>
    </div>
  );
}

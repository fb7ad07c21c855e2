// The header's bell: the unread count of the user's notifications, asked again every minute, and a
// panel listing the newest with links; opening one marks it read, and all can be marked read at once.
import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Bell } from 'lucide-react';
import { formatDateTime } from '@shared/format';
import { UNREAD_COUNT_CAP, type NotificationsView } from '@shared/schemas/notifications';
import { api } from '@/lib/api';

const notificationKeys = { all: ['notifications'] as const };
const POLL_MS = 60_000;

export function NotificationBell() {
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const box = useRef<HTMLDivElement>(null);
  const { data, isError } = useQuery({
    queryKey: notificationKeys.all,
    queryFn: () => api<NotificationsView>('/notifications'),
    refetchInterval: POLL_MS,
  });
  const refresh = () => queryClient.invalidateQueries({ queryKey: notificationKeys.all });
  const markRead = useMutation({ mutationFn: (id: number) => api<void>(`/notifications/${id}/read`, { method: 'POST' }), onSettled: refresh });
  const markAll = useMutation({ mutationFn: () => api<{ marked: number }>('/notifications/read-all', { method: 'POST' }), onSettled: refresh });

  // A click outside the panel or Escape closes it.
  useEffect(() => {
    if (!open) return;
    const onPointer = (event: PointerEvent) => box.current && !box.current.contains(event.target as Node) && setOpen(false);
    const onKey = (event: KeyboardEvent) => event.key === 'Escape' && setOpen(false);
    document.addEventListener('pointerdown', onPointer);
    document.addEventListener('keydown', onKey);
    return () => {
      document.removeEventListener('pointerdown', onPointer);
      document.removeEventListener('keydown', onKey);
    };
  }, [open]);

  const unread = data?.unread ?? 0;
  const shown = unread >= UNREAD_COUNT_CAP ? `${UNREAD_COUNT_CAP - 1}+` : String(unread);
  return (
    <div ref={box} className="relative shrink-0">
      <button
        type="button"
        aria-label={!data ? 'Notifications' : unread ? `Notifications, ${shown} unread` : 'Notifications, none unread'}
        aria-expanded={open}
        aria-haspopup="dialog"
        onClick={() => setOpen((was) => !was)}
        className="relative rounded p-1.5 text-ink-muted hover:bg-paper-sunk hover:text-ink focus:ring-2 focus:ring-frame/25 focus:outline-none"
      >
        <Bell className="h-5 w-5" aria-hidden />
        {unread > 0 && (
          <span
            data-testid="unread-count"
            className="absolute -top-0.5 -right-0.5 min-w-4 rounded-full bg-state-fail px-1 text-center text-2xs leading-4 font-semibold text-white"
          >
            {shown}
          </span>
        )}
      </button>
      {open && (
        <div
          role="dialog"
          aria-label="Notifications"
          className="absolute top-full right-0 z-40 mt-1 w-80 max-w-[calc(100vw-1.5rem)] rounded border border-paper-line bg-paper-card text-sm shadow-lg"
        >
          <div className="flex items-center justify-between border-b border-paper-line px-3 py-2">
            <h2 className="text-sm font-semibold">Notifications</h2>
            <button
              type="button"
              disabled={unread === 0 || markAll.isPending}
              onClick={() => markAll.mutate()}
              className="text-xs text-frame underline disabled:text-ink-muted disabled:no-underline"
            >
              Mark all read
            </button>
          </div>
          {isError ? (
            <p role="alert" className="px-3 py-3 text-state-fail">
              The notifications could not be read.
            </p>
          ) : !data || data.data.length === 0 ? (
            <p className="px-3 py-3 text-ink-muted">Nothing for you yet.</p>
          ) : (
            <ul className="max-h-96 divide-y divide-paper-line overflow-y-auto">
              {data.data.map((n) => (
                <li key={n.id} data-read={n.read} className={n.read ? '' : 'bg-signal/10'}>
                  <Link
                    to={n.link}
                    onClick={() => {
                      setOpen(false);
                      if (!n.read) markRead.mutate(n.id);
                    }}
                    className="block px-3 py-2 text-ink no-underline hover:bg-paper-sunk"
                  >
                    <span className={n.read ? '' : 'font-medium'}>{n.title}</span>
                    <span className="mt-0.5 block text-2xs text-ink-muted">
                      {formatDateTime(n.createdAt)}
                      {n.read ? '' : ' · unread'}
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </div>
  );
}

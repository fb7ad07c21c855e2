import { useMemo, useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { UserPlus } from 'lucide-react';
import { ROLE_LABELS, type Role } from '@shared/schemas/roles';
import type { UserView } from '@shared/schemas/users';
import { Button } from '@/components/Button';
import { DataTable, useListState } from '@/components/DataTable';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useUpdateUser, useUsers } from '../api';
import { NewUserForm } from '../components/NewUserForm';
import { RolePicker } from '../components/RolePicker';
import { UserAccessCell } from '../components/UserAccessCell';
import { formatDateTime } from '@shared/format';

const column = createColumnHelper<UserView>();

function RolesCell({ user }: { user: UserView }) {
  const update = useUpdateUser();
  const [editing, setEditing] = useState<Role[] | null>(null);
  if (!editing) {
    return (
      <button type="button" className="text-left hover:underline" title="Change roles" onClick={() => setEditing(user.roles)}>
        {user.roles.map((r) => ROLE_LABELS[r]).join(', ')}
      </button>
    );
  }
  return (
    <div className="space-y-1.5">
      <RolePicker idPrefix={`roles-${user.id}`} value={editing} onChange={setEditing} />
      {update.error && <p className="text-xs text-state-fail">{update.error.message}</p>}
      <div className="flex gap-1">
        <Button
          className="!py-0.5"
          disabled={editing.length === 0}
          onClick={() => update.mutate({ id: user.id, roles: editing }, { onSuccess: () => setEditing(null) })}
        >
          Save roles
        </Button>
        <Button look="quiet" className="!py-0.5" onClick={() => setEditing(null)}>
          Cancel
        </Button>
      </div>
    </div>
  );
}

function ActiveCell({ user }: { user: UserView }) {
  const update = useUpdateUser();
  return (
    <div className="flex items-center gap-2">
      <span className={user.active ? 'text-state-pass' : 'text-ink-faint'}>{user.active ? 'Active' : 'Deactivated'}</span>
      <Button look="quiet" className="!px-1.5 !py-0 text-xs" onClick={() => update.mutate({ id: user.id, active: !user.active })}>
        {user.active ? 'Deactivate' : 'Reactivate'}
      </Button>
      {update.error && <span className="text-xs text-state-fail">{update.error.message}</span>}
    </div>
  );
}

export function UsersPage() {
  const users = useUsers();
  const { state, update } = useListState({ pageSize: 50, sort: 'name' });
  const [creating, setCreating] = useState(false);
  const columns = useMemo(
    () => [
      column.accessor('name', { header: 'Name' }),
      column.accessor('email', { header: 'E-mail' }),
      column.display({ id: 'roles', header: 'Roles', cell: ({ row }) => <RolesCell user={row.original} /> }),
      column.display({ id: 'active', header: 'Status', cell: ({ row }) => <ActiveCell user={row.original} /> }),
      column.display({ id: 'access', header: 'Password and signing', cell: ({ row }) => <UserAccessCell user={row.original} /> }),
      column.accessor('lastSignInAt', { header: 'Last sign-in', cell: ({ getValue }) => (getValue() ? formatDateTime(getValue()!) : '—') }),
    ],
    [],
  );
  const rows = useMemo(() => {
    const all = [...(users.data?.data ?? [])];
    const key = (state.sort ?? 'name').replace(/^-/, '') as keyof UserView;
    all.sort((a, b) => String(a[key] ?? '').localeCompare(String(b[key] ?? '')) * (state.sort?.startsWith('-') ? -1 : 1));
    return all.slice((state.page - 1) * state.pageSize, state.page * state.pageSize);
  }, [users.data, state.sort, state.page, state.pageSize]);

  return (
    <div>
      <PageHeader
        title="Users"
        subtitle="Accounts and their roles. A user can hold several roles."
        actions={
          !creating && (
            <Button onClick={() => setCreating(true)}>
              <UserPlus className="h-4 w-4" aria-hidden /> New user
            </Button>
          )
        }
      />
      {creating && <NewUserForm onDone={() => setCreating(false)} />}
      {users.error && <Notice tone="error">{users.error.message}</Notice>}
      <DataTable columns={columns} data={rows} total={users.data?.total ?? 0} state={state} onChange={update} isLoading={users.isPending} />
    </div>
  );
}

import type { ReactNode } from 'react';
import { can, type Permission } from '@shared/policies';
import { useSession } from '@/lib/session';
import { Notice } from '@/components/Notice';

/** Shows its page only to roles holding the permission; the API refuses the rest regardless. */
export function RequirePermission({ permission, children }: { permission: Permission; children: ReactNode }) {
  const { data: user } = useSession();
  if (!can(user, permission))
    return (
      <Notice tone="error" title="Not available to your role">
        Ask an administrator if you need access.
      </Notice>
    );
  return <>{children}</>;
}

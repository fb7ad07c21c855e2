// Who may do what: the single table both the server (which enforces it) and the client (which
// only hides what a role cannot do) read. Add a permission here, then name it on the route.
import type { Role } from './schemas/roles';

const EVERYONE: Role[] = ['admin', 'clerk', 'inspector', 'quality', 'buyer', 'auditor'];

export const POLICIES = {
  // One's own account (changing one's password): everyone signed in.
  'account.password': EVERYONE,
  'users.manage': ['admin'],
  'settings.manage': ['admin'],
  'mail.read': ['admin'],
  'catalog.read': EVERYONE,
  'catalog.write': ['buyer'],
  'shipments.receive': ['clerk'],
  'lots.read': EVERYONE,
  'stock.read': EVERYONE,
  // Lot, serial and status labels: whoever may read the lot may print what it says.
  'labels.print': EVERYONE,
  'stock.move': ['clerk'],
  'inspection.perform': ['inspector'],
  'disposition.sign': ['quality'],
  'instruments.read': EVERYONE,
  'instruments.manage': ['quality'],
  // Recording a calibration and attaching its certificate.
  'instruments.calibrate': ['quality', 'admin'],
  // The plan a lot size, level and AQL give (a look-up in the published tables).
  'sampling.read': EVERYONE,
  'sampling.manage': ['quality'],
  'switching.read': ['quality', 'buyer', 'inspector', 'auditor'],
  'switching.manage': ['quality'],
  'certificates.read': EVERYONE,
  'audit.read': ['auditor', 'quality', 'admin'],
  'exports.create': ['auditor', 'quality'],
  'suppliers.performance': ['buyer', 'quality', 'auditor'],
  // Nonconformance reports and returns to the vendor. Inspectors and quality managers open NCRs; the
  // clerk reads them to receive a replacement against one; the quality manager signs dispositions.
  'nonconformance.read': ['quality', 'buyer', 'inspector', 'auditor', 'clerk'],
  'nonconformance.open': ['inspector', 'quality'],
  'nonconformance.disposition': ['quality'],
  'defect-codes.manage': ['quality'],
  'returns.ship': ['quality', 'buyer'],
  // Supplier quality: the deviation register and corrective-action requests to suppliers.
  'deviations.read': ['buyer', 'quality', 'auditor', 'admin'],
  'deviations.manage': ['buyer', 'quality'],
  // The first approval is a quality manager's, the second another user's (quality or admin).
  'deviations.approve': ['quality', 'admin'],
  'corrective.read': ['buyer', 'quality', 'auditor'],
  // Raising a request, revoking its link, sending a new one.
  'corrective.manage': ['buyer', 'quality'],
  // Accepting or returning the supplier's answer, verifying effectiveness and closing.
  'corrective.review': ['quality'],
  // The first screen: the dashboard answers one section per role, each only to users who may also read
  // what it shows (server/dashboard/sections.ts names those reads); the bell, one's own notifications.
  'dashboard.read': EVERYONE,
  'dashboard.receiving': ['clerk'],
  'dashboard.inspection': ['inspector'],
  'dashboard.quality': ['quality'],
  'dashboard.purchasing': ['buyer'],
  'dashboard.audit': ['auditor'],
  'notifications.read': EVERYONE,
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof POLICIES;

export function can(user: { roles: readonly Role[] } | null | undefined, permission: Permission): boolean {
  if (!user) return false;
  const allowed: readonly Role[] = POLICIES[permission];
  return user.roles.some((role) => allowed.includes(role));
}

/** Every permission the user's roles grant. */
export function permissionsOf(user: { roles: readonly Role[] }): Permission[] {
  return (Object.keys(POLICIES) as Permission[]).filter((permission) => can(user, permission));
}

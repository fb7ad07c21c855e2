// The dashboard a user sees: the sections of their roles, each only when they may read all it shows.
import { can } from '../../shared/policies';
import type { DashboardView } from '../../shared/schemas/dashboard';
import type { Role } from '../../shared/schemas/roles';
import { audit, inspection, purchasing, quality, receiving } from './sections';

const SECTIONS = { receiving, inspection, quality, purchasing, audit };

export async function dashboardOf(user: { id: number; roles: readonly Role[] }): Promise<DashboardView> {
  const shown = Object.entries(SECTIONS).filter(([, section]) => [section.permission, ...section.reads].every((permission) => can(user, permission)));
  const read = await Promise.all(shown.map(async ([name, section]) => [name, await section.read(user)] as const));
  return Object.fromEntries(read);
}

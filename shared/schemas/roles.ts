import { z } from 'zod';

export const ROLES = ['admin', 'clerk', 'inspector', 'quality', 'buyer', 'auditor'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  clerk: 'Receiving clerk',
  inspector: 'QC inspector',
  quality: 'Quality manager',
  buyer: 'Buyer',
  auditor: 'Auditor',
};

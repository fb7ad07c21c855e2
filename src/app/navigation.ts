// The app's areas, each shown only to roles holding its permission (the server enforces them anyway).
import type { LucideIcon } from 'lucide-react';
import {
  Archive,
  ArrowDownUp,
  ChartLine,
  ClipboardCheck,
  FileCheck2,
  Gauge,
  Layers,
  Mail,
  Microscope,
  OctagonAlert,
  PackageOpen,
  ReceiptText,
  ScrollText,
  Settings,
  Users,
  Warehouse,
} from 'lucide-react';
import { ShieldAlert, Wrench } from 'lucide-react';
import type { Permission } from '@shared/policies';

export type NavItem = { to: string; label: string; permission?: Permission; icon: LucideIcon; group: 'work' | 'admin' };

export const NAVIGATION: NavItem[] = [
  { to: '/', label: 'Overview', icon: Gauge, group: 'work' },
  { to: '/purchasing', label: 'Purchasing', permission: 'catalog.read', icon: ReceiptText, group: 'work' },
  { to: '/receiving', label: 'Receiving', permission: 'lots.read', icon: PackageOpen, group: 'work' },
  { to: '/lots', label: 'Lots', permission: 'lots.read', icon: Layers, group: 'work' },
  { to: '/inspection', label: 'Inspection', permission: 'lots.read', icon: ClipboardCheck, group: 'work' },
  { to: '/stock', label: 'Stock', permission: 'stock.read', icon: Warehouse, group: 'work' },
  { to: '/switching', label: 'Switching', permission: 'switching.read', icon: ArrowDownUp, group: 'work' },
  { to: '/supplier-performance', label: 'Supplier performance', permission: 'suppliers.performance', icon: ChartLine, group: 'work' },
  { to: '/nonconformances', label: 'Nonconformance', permission: 'nonconformance.read', icon: OctagonAlert, group: 'work' },
  { to: '/deviations', label: 'Deviations', permission: 'deviations.read', icon: ShieldAlert, group: 'work' },
  { to: '/corrective-actions', label: 'Corrective actions', permission: 'corrective.read', icon: Wrench, group: 'work' },
  { to: '/certificates', label: 'Certificates', permission: 'certificates.read', icon: FileCheck2, group: 'work' },
  { to: '/exports', label: 'Exports', permission: 'exports.create', icon: Archive, group: 'work' },
  { to: '/audit', label: 'Audit trail', permission: 'audit.read', icon: ScrollText, group: 'work' },
  { to: '/instruments', label: 'Instruments', permission: 'instruments.read', icon: Microscope, group: 'admin' },
  { to: '/admin/users', label: 'Users', permission: 'users.manage', icon: Users, group: 'admin' },
  { to: '/admin/settings', label: 'Site settings', permission: 'settings.manage', icon: Settings, group: 'admin' },
  { to: '/admin/mail', label: 'Outgoing mail', permission: 'mail.read', icon: Mail, group: 'admin' },
];

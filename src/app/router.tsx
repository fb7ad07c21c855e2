import { createBrowserRouter } from 'react-router';
import { AppLayout } from './AppLayout';
import { RequirePermission } from './RequirePermission';
import { SignInPage } from '@/features/auth/pages/SignInPage';
import { OverviewPage } from '@/features/overview/pages/OverviewPage';
import { UsersPage } from '@/features/admin/pages/UsersPage';
import { CaughtMailPage } from '@/features/admin/pages/CaughtMailPage';
import { SiteSettingsPage } from '@/features/admin/pages/SiteSettingsPage';
import { InstrumentsPage } from '@/features/instruments/pages/InstrumentsPage';
import { InspectionQueuePage } from '@/features/inspection/pages/InspectionQueuePage';
import { LotInspectionPage } from '@/features/inspection/pages/LotInspectionPage';
import { CertificatesPage } from '@/features/audit/pages/CertificatesPage';
import { ExportsPage } from '@/features/audit/pages/ExportsPage';
import { AuditTrailPage } from '@/features/audit/pages/AuditTrailPage';
import { VerifyPage } from '@/features/audit/pages/VerifyPage';

export const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage /> },
  { path: '/verify', element: <VerifyPage /> },
  {
    element: <AppLayout />,
    children: [
      { index: true, element: <OverviewPage /> },
      { path: 'inspection', element: <InspectionQueuePage /> },
      { path: 'inspection/lots/:lotId', element: <LotInspectionPage /> },
      { path: 'instruments', element: <InstrumentsPage /> },
      { path: 'certificates', element: <RequirePermission permission="certificates.read"><CertificatesPage /></RequirePermission> },
      { path: 'exports', element: <RequirePermission permission="exports.create"><ExportsPage /></RequirePermission> },
      { path: 'audit', element: <RequirePermission permission="audit.read"><AuditTrailPage /></RequirePermission> },
      { path: 'admin/users', element: <RequirePermission permission="users.manage"><UsersPage /></RequirePermission> },
      { path: 'admin/settings', element: <RequirePermission permission="settings.manage"><SiteSettingsPage /></RequirePermission> },
      { path: 'admin/mail', element: <RequirePermission permission="mail.read"><CaughtMailPage /></RequirePermission> },
      { path: '*', element: <p className="text-ink-muted">This page does not exist.</p> },
    ],
  },
]);

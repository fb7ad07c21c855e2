import { createBrowserRouter, Navigate } from 'react-router';
import { AppLayout } from './AppLayout';
import { RequirePermission } from './RequirePermission';
import { SignInPage } from '@/features/auth/pages/SignInPage';
import { ForgotPasswordPage } from '@/features/auth/pages/ForgotPasswordPage';
import { ResetPasswordPage } from '@/features/auth/pages/ResetPasswordPage';
import { ChangePasswordPage } from '@/features/auth/pages/ChangePasswordPage';
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
import { PurchaseOrdersPage } from '@/features/purchasing/pages/PurchaseOrdersPage';
import { PurchaseOrderPage } from '@/features/purchasing/pages/PurchaseOrderPage';
import { PartsPage } from '@/features/purchasing/pages/PartsPage';
import { PartPage } from '@/features/purchasing/pages/PartPage';
import { SuppliersPage } from '@/features/purchasing/pages/SuppliersPage';
import { ShipmentsPage } from '@/features/receiving/pages/ShipmentsPage';
import { ReceivePage } from '@/features/receiving/pages/ReceivePage';
import { LotsPage } from '@/features/receiving/pages/LotsPage';
import { LotPage } from '@/features/receiving/pages/LotPage';
import { StockPage } from '@/features/stock/pages/StockPage';
import { MovesPage } from '@/features/stock/pages/MovesPage';
import { StockMovePage } from '@/features/stock/pages/StockMovePage';
import { PiecePage } from '@/features/stock/pages/PiecePage';
import { SwitchingListPage } from '@/features/switching/pages/SwitchingListPage';
import { SwitchingPage } from '@/features/switching/pages/SwitchingPage';

export const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage /> },
  { path: '/forgot-password', element: <ForgotPasswordPage /> },
  { path: '/reset-password', element: <ResetPasswordPage /> },
  { path: '/verify', element: <VerifyPage /> },
  {
    element: <AppLayout />,
    children: [
      { index: true, element: <OverviewPage /> },
      { path: 'account/password', element: <ChangePasswordPage /> },
      { path: 'purchasing', element: <Navigate to="/purchasing/orders" replace /> },
      { path: 'purchasing/orders', element: <PurchaseOrdersPage /> },
      { path: 'purchasing/orders/new', element: <PurchaseOrderPage /> },
      { path: 'purchasing/orders/:orderId', element: <PurchaseOrderPage /> },
      { path: 'purchasing/orders/:orderId/edit', element: <PurchaseOrderPage editing /> },
      { path: 'purchasing/parts', element: <PartsPage /> },
      { path: 'purchasing/parts/:partId', element: <PartPage /> },
      { path: 'purchasing/suppliers', element: <SuppliersPage /> },
      { path: 'receiving', element: <ShipmentsPage /> },
      { path: 'receiving/new', element: <ReceivePage /> },
      { path: 'lots', element: <LotsPage /> },
      { path: 'lots/:lotId', element: <LotPage /> },
      { path: 'stock', element: <StockPage /> },
      { path: 'stock/moves', element: <MovesPage /> },
      { path: 'stock/issue', element: <StockMovePage key="issue" move="issue" /> },
      { path: 'stock/transfer', element: <StockMovePage key="transfer" move="transfer" /> },
      { path: 'stock/put-away', element: <StockMovePage key="put-away" move="put-away" /> },
      { path: 'pieces', element: <PiecePage /> },
      { path: 'pieces/:serial', element: <PiecePage /> },
      { path: 'inspection', element: <InspectionQueuePage /> },
      { path: 'inspection/lots/:lotId', element: <LotInspectionPage /> },
      { path: 'switching', element: <RequirePermission permission="switching.read"><SwitchingListPage /></RequirePermission> },
      { path: 'switching/:supplierId/:partId', element: <RequirePermission permission="switching.read"><SwitchingPage /></RequirePermission> },
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

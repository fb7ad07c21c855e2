import type { ReactElement } from 'react';
import { createBrowserRouter, Navigate } from 'react-router-dom';
import { AppLayout } from './AppLayout';
import { RequirePermission } from './RequirePermission';
import { SignInPage } from '@/features/auth/pages/SignInPage';

// The first page loads sign-in and the shell only. Every other page is a chunk of its own, fetched
// when its route is first visited (the router waits for it, keeping the page before on screen), so
// the chart library comes with the pages that draw charts and nowhere else.
const page =
  <M,>(load: () => Promise<M>, render: (module: M) => ReactElement) =>
  async () => ({ element: render(await load()) });

const purchaseOrderPage = () => import('@/features/purchasing/pages/PurchaseOrderPage');
const piecePage = () => import('@/features/stock/pages/PiecePage');
const stockMovePage = () => import('@/features/stock/pages/StockMovePage');
const deviationsPage = () => import('@/features/supplierquality/pages/DeviationsPage');

export const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage /> },
  {
    path: '/forgot-password',
    lazy: page(
      () => import('@/features/auth/pages/ForgotPasswordPage'),
      (m) => <m.ForgotPasswordPage />,
    ),
  },
  {
    path: '/reset-password',
    lazy: page(
      () => import('@/features/auth/pages/ResetPasswordPage'),
      (m) => <m.ResetPasswordPage />,
    ),
  },
  {
    path: '/verify',
    lazy: page(
      () => import('@/features/audit/pages/VerifyPage'),
      (m) => <m.VerifyPage />,
    ),
  },
  // The supplier's answer to a corrective-action request: public, through the mailed link.
  {
    path: '/respond',
    lazy: page(
      () => import('@/features/supplierquality/pages/SupplierResponsePage'),
      (m) => <m.SupplierResponsePage />,
    ),
  },
  {
    element: <AppLayout />,
    children: [
      {
        index: true,
        lazy: page(
          () => import('@/features/dashboard/pages/DashboardPage'),
          (m) => <m.DashboardPage />,
        ),
      },
      {
        path: 'account/password',
        lazy: page(
          () => import('@/features/auth/pages/ChangePasswordPage'),
          (m) => <m.ChangePasswordPage />,
        ),
      },
      { path: 'purchasing', element: <Navigate to="/purchasing/orders" replace /> },
      {
        path: 'purchasing/orders',
        lazy: page(
          () => import('@/features/purchasing/pages/PurchaseOrdersPage'),
          (m) => <m.PurchaseOrdersPage />,
        ),
      },
      { path: 'purchasing/orders/new', lazy: page(purchaseOrderPage, (m) => <m.PurchaseOrderPage />) },
      { path: 'purchasing/orders/:orderId', lazy: page(purchaseOrderPage, (m) => <m.PurchaseOrderPage />) },
      { path: 'purchasing/orders/:orderId/edit', lazy: page(purchaseOrderPage, (m) => <m.PurchaseOrderPage editing />) },
      {
        path: 'purchasing/parts',
        lazy: page(
          () => import('@/features/purchasing/pages/PartsPage'),
          (m) => <m.PartsPage />,
        ),
      },
      {
        path: 'purchasing/parts/:partId',
        lazy: page(
          () => import('@/features/purchasing/pages/PartPage'),
          (m) => <m.PartPage />,
        ),
      },
      {
        path: 'purchasing/suppliers',
        lazy: page(
          () => import('@/features/purchasing/pages/SuppliersPage'),
          (m) => <m.SuppliersPage />,
        ),
      },
      {
        path: 'receiving',
        lazy: page(
          () => import('@/features/receiving/pages/ShipmentsPage'),
          (m) => <m.ShipmentsPage />,
        ),
      },
      {
        path: 'receiving/new',
        lazy: page(
          () => import('@/features/receiving/pages/ReceivePage'),
          (m) => <m.ReceivePage />,
        ),
      },
      {
        path: 'lots',
        lazy: page(
          () => import('@/features/receiving/pages/LotsPage'),
          (m) => <m.LotsPage />,
        ),
      },
      {
        path: 'lots/:lotId',
        lazy: page(
          () => import('@/features/receiving/pages/LotPage'),
          (m) => <m.LotPage />,
        ),
      },
      {
        path: 'stock',
        lazy: page(
          () => import('@/features/stock/pages/StockPage'),
          (m) => <m.StockPage />,
        ),
      },
      {
        path: 'stock/moves',
        lazy: page(
          () => import('@/features/stock/pages/MovesPage'),
          (m) => <m.MovesPage />,
        ),
      },
      { path: 'stock/issue', lazy: page(stockMovePage, (m) => <m.StockMovePage key="issue" move="issue" />) },
      { path: 'stock/transfer', lazy: page(stockMovePage, (m) => <m.StockMovePage key="transfer" move="transfer" />) },
      { path: 'stock/put-away', lazy: page(stockMovePage, (m) => <m.StockMovePage key="put-away" move="put-away" />) },
      { path: 'pieces', lazy: page(piecePage, (m) => <m.PiecePage />) },
      { path: 'pieces/:serial', lazy: page(piecePage, (m) => <m.PiecePage />) },
      {
        path: 'inspection',
        lazy: page(
          () => import('@/features/inspection/pages/InspectionQueuePage'),
          (m) => <m.InspectionQueuePage />,
        ),
      },
      {
        path: 'inspection/lots/:lotId',
        lazy: page(
          () => import('@/features/inspection/pages/LotInspectionPage'),
          (m) => <m.LotInspectionPage />,
        ),
      },
      {
        path: 'switching',
        lazy: page(
          () => import('@/features/switching/pages/SwitchingListPage'),
          (m) => (
            <RequirePermission permission="switching.read">
              <m.SwitchingListPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'switching/:supplierId/:partId',
        lazy: page(
          () => import('@/features/switching/pages/SwitchingPage'),
          (m) => (
            <RequirePermission permission="switching.read">
              <m.SwitchingPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'nonconformances',
        lazy: page(
          () => import('@/features/nonconformance/pages/NcrListPage'),
          (m) => (
            <RequirePermission permission="nonconformance.read">
              <m.NcrListPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'nonconformances/new',
        lazy: page(
          () => import('@/features/nonconformance/pages/OpenNcrPage'),
          (m) => (
            <RequirePermission permission="nonconformance.open">
              <m.OpenNcrPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'nonconformances/returns',
        lazy: page(
          () => import('@/features/nonconformance/pages/ReturnsPage'),
          (m) => (
            <RequirePermission permission="nonconformance.read">
              <m.ReturnsPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'nonconformances/defect-codes',
        lazy: page(
          () => import('@/features/nonconformance/pages/DefectCodesPage'),
          (m) => (
            <RequirePermission permission="nonconformance.read">
              <m.DefectCodesPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'nonconformances/:ncrId',
        lazy: page(
          () => import('@/features/nonconformance/pages/NcrPage'),
          (m) => (
            <RequirePermission permission="nonconformance.read">
              <m.NcrPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'deviations',
        lazy: page(deviationsPage, (m) => (
          <RequirePermission permission="deviations.read">
            <m.DeviationsPage key="list" />
          </RequirePermission>
        )),
      },
      {
        path: 'deviations/new',
        lazy: page(deviationsPage, (m) => (
          <RequirePermission permission="deviations.manage">
            <m.DeviationsPage key="new" writing />
          </RequirePermission>
        )),
      },
      {
        path: 'deviations/:deviationId',
        lazy: page(
          () => import('@/features/supplierquality/pages/DeviationPage'),
          (m) => (
            <RequirePermission permission="deviations.read">
              <m.DeviationPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'corrective-actions',
        lazy: page(
          () => import('@/features/supplierquality/pages/CorrectiveActionsPage'),
          (m) => (
            <RequirePermission permission="corrective.read">
              <m.CorrectiveActionsPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'corrective-actions/new',
        lazy: page(
          () => import('@/features/supplierquality/pages/NewCorrectiveActionPage'),
          (m) => (
            <RequirePermission permission="corrective.manage">
              <m.NewCorrectiveActionPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'corrective-actions/:requestId',
        lazy: page(
          () => import('@/features/supplierquality/pages/CorrectiveActionPage'),
          (m) => (
            <RequirePermission permission="corrective.read">
              <m.CorrectiveActionPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'supplier-performance',
        lazy: page(
          () => import('@/features/supplierperformance/pages/SupplierRankingPage'),
          (m) => (
            <RequirePermission permission="suppliers.performance">
              <m.SupplierRankingPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'supplier-performance/:supplierId',
        lazy: page(
          () => import('@/features/supplierperformance/pages/SupplierPerformancePage'),
          (m) => (
            <RequirePermission permission="suppliers.performance">
              <m.SupplierPerformancePage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'instruments',
        lazy: page(
          () => import('@/features/instruments/pages/InstrumentsPage'),
          (m) => <m.InstrumentsPage />,
        ),
      },
      {
        path: 'instruments/:id',
        lazy: page(
          () => import('@/features/instruments/pages/InstrumentPage'),
          (m) => <m.InstrumentPage />,
        ),
      },
      {
        path: 'certificates',
        lazy: page(
          () => import('@/features/audit/pages/CertificatesPage'),
          (m) => (
            <RequirePermission permission="certificates.read">
              <m.CertificatesPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'exports',
        lazy: page(
          () => import('@/features/audit/pages/ExportsPage'),
          (m) => (
            <RequirePermission permission="exports.create">
              <m.ExportsPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'audit',
        lazy: page(
          () => import('@/features/audit/pages/AuditTrailPage'),
          (m) => (
            <RequirePermission permission="audit.read">
              <m.AuditTrailPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'admin/users',
        lazy: page(
          () => import('@/features/admin/pages/UsersPage'),
          (m) => (
            <RequirePermission permission="users.manage">
              <m.UsersPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'admin/settings',
        lazy: page(
          () => import('@/features/admin/pages/SiteSettingsPage'),
          (m) => (
            <RequirePermission permission="settings.manage">
              <m.SiteSettingsPage />
            </RequirePermission>
          ),
        ),
      },
      {
        path: 'admin/mail',
        lazy: page(
          () => import('@/features/admin/pages/CaughtMailPage'),
          (m) => (
            <RequirePermission permission="mail.read">
              <m.CaughtMailPage />
            </RequirePermission>
          ),
        ),
      },
      { path: '*', element: <p className="text-ink-muted">This page does not exist.</p> },
    ],
  },
]);

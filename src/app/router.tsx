import { createBrowserRouter, RouterProvider } from 'react-router';
import { PageSpinner } from '@/components/ui/spinner';
import { NotFoundPage } from '@/app/routes/not-found';
import { ProtectedLayout, protectedLoader } from '@/app/routes/protected-layout';
import { RoleGate } from '@/app/routes/role-gate';
import { Root } from '@/app/routes/root';
import { RouteErrorPage } from '@/app/routes/route-error';

// Pages load lazily (each module exports `Component`), so a chart library or a camera
// helper is downloaded only by the people who open that page.
export const router = createBrowserRouter([
  {
    id: 'root',
    element: <Root />,
    errorElement: <RouteErrorPage />,
    hydrateFallbackElement: <PageSpinner />,
    children: [
      { path: 'sign-in', lazy: () => import('@/app/routes/sign-in') },
      { path: 'forgot-password', lazy: () => import('@/app/routes/forgot-password') },
      // Reset links and invitations share this page.
      { path: 'reset-password/:token', lazy: () => import('@/app/routes/reset-password') },
      // Mailed sign-in links: the way in while password sign-in is paused.
      { path: 'sign-in-link', lazy: () => import('@/app/routes/sign-in-link') },
      { path: 'sign-in-link/:token', lazy: () => import('@/app/routes/sign-in-link-use') },
      // A lobby display signs in with its key; the unfollow link in an e-mail needs no sign-in.
      { path: 'display/:key', lazy: () => import('@/app/routes/display') },
      { path: 'unfollow/:token', lazy: () => import('@/app/routes/unfollow') },
      {
        id: 'protected',
        loader: protectedLoader,
        element: <ProtectedLayout />,
        children: [
          {
            // Errors inside a page keep the top bar, so the way out stays in view.
            errorElement: <RouteErrorPage />,
            children: [
              { index: true, lazy: () => import('@/app/routes/home') },

              // Open to every signed-in user.
              { path: 'board', lazy: () => import('@/app/routes/board') },
              { path: 'tools/:code', lazy: () => import('@/app/routes/tools/tool-page') },
              { path: 'report', lazy: () => import('@/app/routes/report') },
              { path: 'tickets/:id', lazy: () => import('@/app/routes/tickets') },
              { path: 'my-reports', lazy: () => import('@/app/routes/my-reports') },
              { path: 'following', lazy: () => import('@/app/routes/following') },

              // ---- Admin only ----
              {
                element: <RoleGate minimum="admin" />,
                children: [
                  { path: 'admin', lazy: () => import('@/app/routes/admin/index') },
                  { path: 'admin/users', lazy: () => import('@/app/routes/admin/users') },
                  { path: 'admin/mail', lazy: () => import('@/app/routes/admin/mail') },
                  { path: 'admin/facility', lazy: () => import('@/app/routes/admin/facility') },
                  { path: 'admin/displays', lazy: () => import('@/app/routes/admin/displays') },
                  { path: 'admin/settings', lazy: () => import('@/app/routes/admin/facility-settings') },
                ],
              },
              // Technicians and up; managers and up.
              {
                element: <RoleGate minimum="technician" />,
                children: [{ path: 'labels', lazy: () => import('@/app/routes/tools/labels') }],
              },
              { element: <RoleGate minimum="technician" />, children: [{ path: 'queue', lazy: () => import('@/app/routes/queue') }] },
              {
                element: <RoleGate minimum="technician" />,
                children: [
                  { path: 'maintenance', lazy: () => import('@/app/routes/maintenance/index') },
                  { path: 'maintenance/work-orders/:id', lazy: () => import('@/app/routes/maintenance/work-order') },
                  { path: 'maintenance/work-orders/:id/print', lazy: () => import('@/app/routes/maintenance/print') },
                  { path: 'maintenance/parts', lazy: () => import('@/app/routes/maintenance/parts') },
                ],
              },
              { path: 'calendar-feeds', lazy: () => import('@/app/routes/maintenance/calendar-feeds') },
              {
                element: <RoleGate minimum="manager" />,
                children: [{ path: 'admin/service-targets', lazy: () => import('@/app/routes/admin-service-targets') }],
              },
              { element: <RoleGate minimum="manager" />, children: [{ path: 'analytics', lazy: () => import('@/app/routes/analytics') }] },

              { path: '*', element: <NotFoundPage /> },
            ],
          },
        ],
      },
    ],
  },
]);

export function AppRouter() {
  return <RouterProvider router={router} />;
}

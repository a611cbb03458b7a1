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

              // ---- Feature routes: one line each, lazy-loaded; add the page's NAV_ITEMS entry as ready ----
              // Open to every signed-in user. Example shape:
              //   { path: 'board', lazy: () => import('@/app/routes/board') },

              // ---- Admin only ----
              {
                element: <RoleGate minimum="admin" />,
                children: [
                  { path: 'admin/mail', lazy: () => import('@/app/routes/admin/mail') },
                ],
              },
              // Pages for technicians or managers go in their own group, like the admin one:
              //   { element: <RoleGate minimum="technician" />, children: [ ...one line per page... ] },

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

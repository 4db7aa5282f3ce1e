import type { QueryClient } from '@tanstack/react-query';
import type { ComponentType } from 'react';
import { createBrowserRouter, type LoaderFunction, redirect } from 'react-router-dom';
import { setUnauthenticatedHandler } from '../lib/api-client';
import * as appRoot from './routes/app-root';
import { NotFoundRoute } from './routes/not-found';
import { RouteError } from './routes/route-error';

/** What a page module exports besides its component: an optional loader factory. */
type PageModule = { clientLoader?: (queryClient: QueryClient) => LoaderFunction };

/**
 * The route tree. A page that needs data exports `clientLoader(queryClient)`, which
 * prefetches the query options the page reads. A new matter section goes under
 * `matters/:matterId` here and into src/features/matters/matter-sections.ts.
 */
export function createAppRouter(queryClient: QueryClient) {
  // Each page is its own chunk, fetched on first visit (React Router's route.lazy), so
  // the sign-in screen and the matter list do not carry the chart, map and review code.
  const page =
    <M,>(load: () => Promise<M>, component: (module: M) => ComponentType) =>
    async () => {
      const module = await load();
      const loader = (module as PageModule).clientLoader?.(queryClient);
      return { Component: component(module), ...(loader ? { loader } : {}) };
    };

  const router = createBrowserRouter([
    {
      path: '/sign-in',
      lazy: page(
        () => import('./routes/sign-in'),
        (m) => m.SignInRoute,
      ),
      ErrorBoundary: RouteError,
    },
    {
      path: '/invitations/:token',
      lazy: page(
        () => import('./routes/invitation'),
        (m) => m.InvitationRoute,
      ),
      ErrorBoundary: RouteError,
    },
    {
      path: '/account-setup/:token',
      lazy: page(
        () => import('./routes/account-setup'),
        (m) => m.AccountSetupRoute,
      ),
      ErrorBoundary: RouteError,
    },
    {
      path: '/dev/mail',
      lazy: page(
        () => import('./routes/dev-mail'),
        (m) => m.DevMailRoute,
      ),
      ErrorBoundary: RouteError,
    },
    {
      id: 'app',
      loader: appRoot.clientLoader(queryClient),
      Component: appRoot.AppRoot,
      ErrorBoundary: RouteError,
      children: [
        { index: true, loader: () => redirect('/matters') },
        {
          path: 'matters',
          lazy: page(
            () => import('./routes/matters'),
            (m) => m.MattersRoute,
          ),
        },
        {
          path: 'matters/:matterId',
          lazy: page(
            () => import('./routes/matter/layout'),
            (m) => m.MatterLayout,
          ),
          ErrorBoundary: RouteError,
          children: [
            {
              index: true,
              lazy: page(
                () => import('./routes/matter/home'),
                (m) => m.MatterHomeRoute,
              ),
            },
            {
              path: 'documents',
              lazy: page(
                () => import('./routes/matter/documents'),
                (m) => m.DocumentsRoute,
              ),
            },
            {
              path: 'documents/:docId',
              lazy: page(
                () => import('./routes/matter/documents-item'),
                (m) => m.DocumentRoute,
              ),
            },
            {
              path: 'search',
              lazy: page(
                () => import('./routes/matter/search'),
                (m) => m.SearchRoute,
              ),
            },
            {
              path: 'search/term-report',
              lazy: page(
                () => import('./routes/matter/search'),
                (m) => m.TermReportRoute,
              ),
            },
            {
              path: 'review/:docId',
              lazy: page(
                () => import('./routes/matter/review'),
                (m) => m.ReviewRoute,
              ),
            },
            {
              path: 'concepts',
              lazy: page(
                () => import('./routes/matter/concepts'),
                (m) => m.ConceptsLayout,
              ),
              children: [
                {
                  index: true,
                  lazy: page(
                    () => import('./routes/matter/concepts'),
                    (m) => m.ConceptsIndexRoute,
                  ),
                },
                {
                  path: 'spectrum',
                  lazy: page(
                    () => import('./routes/matter/concepts-spectrum'),
                    (m) => m.ConceptsSpectrumRoute,
                  ),
                },
                {
                  path: 'dimensions',
                  lazy: page(
                    () => import('./routes/matter/concepts-dimensions'),
                    (m) => m.ConceptsDimensionsRoute,
                  ),
                },
                {
                  path: 'terms',
                  lazy: page(
                    () => import('./routes/matter/concepts-terms'),
                    (m) => m.ConceptsTermsRoute,
                  ),
                },
                {
                  path: 'map',
                  lazy: page(
                    () => import('./routes/matter/concepts-map'),
                    (m) => m.ConceptsMapRoute,
                  ),
                },
                {
                  path: 'groups',
                  lazy: page(
                    () => import('./routes/matter/concepts-groups'),
                    (m) => m.ConceptsGroupsRoute,
                  ),
                },
                {
                  path: 'health',
                  lazy: page(
                    () => import('./routes/matter/concepts-health'),
                    (m) => m.ConceptsHealthRoute,
                  ),
                },
              ],
            },
            {
              path: 'codes',
              lazy: page(
                () => import('./routes/matter/codes'),
                (m) => m.CodesRoute,
              ),
            },
            {
              path: 'upload',
              lazy: page(
                () => import('./routes/matter/upload'),
                (m) => m.UploadRoute,
              ),
            },
            {
              path: 'access',
              lazy: page(
                () => import('./routes/matter/access'),
                (m) => m.AccessRoute,
              ),
            },
            {
              path: 'activity',
              lazy: page(
                () => import('./routes/matter/activity'),
                (m) => m.ActivityRoute,
              ),
            },
            {
              path: 'trash',
              lazy: page(
                () => import('./routes/matter/trash'),
                (m) => m.TrashRoute,
              ),
            },
            {
              path: 'batches',
              lazy: page(
                () => import('./routes/matter/batches'),
                (m) => m.BatchesRoute,
              ),
            },
            {
              path: 'qc',
              lazy: page(
                () => import('./routes/matter/qc'),
                (m) => m.QcRoute,
              ),
            },
            {
              path: 'privilege-log',
              lazy: page(
                () => import('./routes/matter/privilege-log'),
                (m) => m.PrivilegeLogRoute,
              ),
            },
            {
              path: 'productions',
              lazy: page(
                () => import('./routes/matter/productions'),
                (m) => m.ProductionsRoute,
              ),
            },
            {
              path: 'prioritised',
              lazy: page(
                () => import('./routes/matter/prioritised'),
                (m) => m.PrioritisedRoute,
              ),
            },
            {
              path: 'validation',
              lazy: page(
                () => import('./routes/matter/validation'),
                (m) => m.ValidationRoute,
              ),
            },
            {
              path: 'validation/:sampleId',
              lazy: page(
                () => import('./routes/matter/validation-sample'),
                (m) => m.ValidationSampleRoute,
              ),
            },
          ],
        },
        {
          path: 'account',
          lazy: page(
            () => import('./routes/account'),
            (m) => m.AccountRoute,
          ),
        },
        {
          path: 'admin',
          lazy: page(
            () => import('./routes/admin'),
            (m) => m.AdminRoute,
          ),
        },
        { path: '*', Component: NotFoundRoute },
      ],
    },
  ]);

  // A 401 mid-session (expired, or ended by a password change) goes to sign-in and back.
  setUnauthenticatedHandler(() => {
    const { pathname, search } = router.state.location;
    if (pathname.startsWith('/sign-in') || pathname.startsWith('/invitations/')) return;
    queryClient.clear();
    void router.navigate(`/sign-in?next=${encodeURIComponent(pathname + search)}`, {
      replace: true,
    });
  });
  return router;
}

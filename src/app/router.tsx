import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, redirect } from 'react-router-dom';
import { setUnauthenticatedHandler } from '../lib/api-client';
import * as account from './routes/account';
import * as accountSetup from './routes/account-setup';
import * as admin from './routes/admin';
import * as appRoot from './routes/app-root';
import * as devMail from './routes/dev-mail';
import * as invitation from './routes/invitation';
import * as matterAccess from './routes/matter/access';
import * as matterActivity from './routes/matter/activity';
import * as matterCodes from './routes/matter/codes';
import * as matterConcepts from './routes/matter/concepts';
import * as matterConceptsDimensions from './routes/matter/concepts-dimensions';
import * as matterConceptsGroups from './routes/matter/concepts-groups';
import * as matterConceptsHealth from './routes/matter/concepts-health';
import * as matterConceptsMap from './routes/matter/concepts-map';
import * as matterConceptsSpectrum from './routes/matter/concepts-spectrum';
import * as matterConceptsTerms from './routes/matter/concepts-terms';
import * as matterDocument from './routes/matter/documents-item';
import * as matterDocuments from './routes/matter/documents';
import * as matterHome from './routes/matter/home';
import * as matterLayout from './routes/matter/layout';
import * as matterProductions from './routes/matter/productions';
import * as matterReview from './routes/matter/review';
import * as matterBatches from './routes/matter/batches';
import * as matterQc from './routes/matter/qc';
import * as matterPrivilegeLog from './routes/matter/privilege-log';
import * as matterSearch from './routes/matter/search';
import * as matterTrash from './routes/matter/trash';
import * as matterUpload from './routes/matter/upload';
import * as matterPrioritised from './routes/matter/prioritised';
import * as matterValidation from './routes/matter/validation';
import * as matterValidationSample from './routes/matter/validation-sample';
import * as matters from './routes/matters';
import { NotFoundRoute } from './routes/not-found';
import { RouteError } from './routes/route-error';
import * as signIn from './routes/sign-in';

/**
 * The route tree. A page that needs data exports `clientLoader(queryClient)`, which
 * prefetches the query options the page reads. A new matter section goes under
 * `matters/:matterId` here and into src/features/matters/matter-sections.ts.
 */
export function createAppRouter(queryClient: QueryClient) {
  const router = createBrowserRouter([
    {
      path: '/sign-in',
      loader: signIn.clientLoader(queryClient),
      Component: signIn.SignInRoute,
      ErrorBoundary: RouteError,
    },
    {
      path: '/invitations/:token',
      Component: invitation.InvitationRoute,
      ErrorBoundary: RouteError,
    },
    {
      path: '/account-setup/:token',
      Component: accountSetup.AccountSetupRoute,
      ErrorBoundary: RouteError,
    },
    { path: '/dev/mail', Component: devMail.DevMailRoute, ErrorBoundary: RouteError },
    {
      id: 'app',
      loader: appRoot.clientLoader(queryClient),
      Component: appRoot.AppRoot,
      ErrorBoundary: RouteError,
      children: [
        { index: true, loader: () => redirect('/matters') },
        {
          path: 'matters',
          loader: matters.clientLoader(queryClient),
          Component: matters.MattersRoute,
        },
        {
          path: 'matters/:matterId',
          loader: matterLayout.clientLoader(queryClient),
          Component: matterLayout.MatterLayout,
          ErrorBoundary: RouteError,
          children: [
            { index: true, Component: matterHome.MatterHomeRoute },
            {
              path: 'documents',
              loader: matterDocuments.clientLoader(queryClient),
              Component: matterDocuments.DocumentsRoute,
            },
            {
              path: 'documents/:docId',
              loader: matterDocument.clientLoader(queryClient),
              Component: matterDocument.DocumentRoute,
            },
            {
              path: 'search',
              loader: matterSearch.clientLoader(queryClient),
              Component: matterSearch.SearchRoute,
            },
            { path: 'search/term-report', Component: matterSearch.TermReportRoute },
            {
              path: 'review/:docId',
              loader: matterReview.clientLoader(queryClient),
              Component: matterReview.ReviewRoute,
            },
            {
              path: 'concepts',
              Component: matterConcepts.ConceptsLayout,
              children: [
                { index: true, Component: matterConcepts.ConceptsIndexRoute },
                {
                  path: 'spectrum',
                  loader: matterConceptsSpectrum.clientLoader(queryClient),
                  Component: matterConceptsSpectrum.ConceptsSpectrumRoute,
                },
                {
                  path: 'dimensions',
                  loader: matterConceptsDimensions.clientLoader(queryClient),
                  Component: matterConceptsDimensions.ConceptsDimensionsRoute,
                },
                { path: 'terms', Component: matterConceptsTerms.ConceptsTermsRoute },
                {
                  path: 'map',
                  loader: matterConceptsMap.clientLoader(queryClient),
                  Component: matterConceptsMap.ConceptsMapRoute,
                },
                {
                  path: 'groups',
                  loader: matterConceptsGroups.clientLoader(queryClient),
                  Component: matterConceptsGroups.ConceptsGroupsRoute,
                },
                {
                  path: 'health',
                  loader: matterConceptsHealth.clientLoader(queryClient),
                  Component: matterConceptsHealth.ConceptsHealthRoute,
                },
              ],
            },
            {
              path: 'codes',
              loader: matterCodes.clientLoader(queryClient),
              Component: matterCodes.CodesRoute,
            },
            {
              path: 'upload',
              loader: matterUpload.clientLoader(queryClient),
              Component: matterUpload.UploadRoute,
            },
            {
              path: 'access',
              loader: matterAccess.clientLoader(queryClient),
              Component: matterAccess.AccessRoute,
            },
            {
              path: 'activity',
              loader: matterActivity.clientLoader(queryClient),
              Component: matterActivity.ActivityRoute,
            },
            { path: 'batches', Component: matterBatches.BatchesRoute },
            { path: 'qc', Component: matterQc.QcRoute },
            { path: 'privilege-log', Component: matterPrivilegeLog.PrivilegeLogRoute },
            {
              path: 'trash',
              loader: matterTrash.clientLoader(queryClient),
              Component: matterTrash.TrashRoute,
            },
            { path: 'productions', Component: matterProductions.ProductionsRoute },
            {
              path: 'prioritised',
              loader: matterPrioritised.clientLoader(queryClient),
              Component: matterPrioritised.PrioritisedRoute,
            },
            {
              path: 'validation',
              loader: matterValidation.clientLoader(queryClient),
              Component: matterValidation.ValidationRoute,
            },
            {
              path: 'validation/:sampleId',
              Component: matterValidationSample.ValidationSampleRoute,
            },
          ],
        },
        { path: 'account', Component: account.AccountRoute },
        { path: 'admin', loader: admin.clientLoader(queryClient), Component: admin.AdminRoute },
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

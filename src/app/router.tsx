import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router';
import { RouteError } from '../components/route-error.tsx';
import { AcceptInviteRoute } from './routes/accept-invite.tsx';
import { ConfirmSignUpRoute } from './routes/confirm-sign-up.tsx';
import { AppLayout, AppLayoutFallback, appLayoutLoader } from './routes/app-layout.tsx';
import { NotFoundRoute } from './routes/not-found.tsx';
import { SignInRoute } from './routes/sign-in.tsx';
import { SignUpRoute } from './routes/sign-up.tsx';
import { StudiesRoute } from './routes/studies.tsx';
import { parseStudyListParams, studiesQueryOptions } from '../features/studies/api/get-studies.ts';
import { studyQueryOptions } from '../features/studies/api/get-study.ts';
import { teamQueryOptions } from '../lib/api/team.ts';
import { mailQueryOptions } from '../features/team/api/get-mail.ts';

/**
 * The route table; the study and team pages load on demand so the list stays light. Loaders start
 * each page's query while its code downloads (prefetch never throws: the page shows its own errors).
 */
export function createRoutes(queryClient: QueryClient): RouteObject[] {
  const prefetch = (start: (client: QueryClient) => Promise<void>) => {
    void start(queryClient);
    return null;
  };
  return [
    // No loaders here: the signed-out pages render at once (the demo list starts loading immediately).
    { path: '/sign-in', element: <SignInRoute />, errorElement: <RouteError /> },
    { path: '/sign-up', element: <SignUpRoute />, errorElement: <RouteError /> },
    { path: '/sign-up/confirm', element: <ConfirmSignUpRoute />, errorElement: <RouteError /> },
    { path: '/invite/:token', element: <AcceptInviteRoute />, errorElement: <RouteError /> },
    {
      path: '/',
      element: <AppLayout />,
      loader: appLayoutLoader(queryClient),
      hydrateFallbackElement: <AppLayoutFallback />,
      errorElement: <RouteError />,
      children: [
        {
          index: true,
          element: <StudiesRoute />,
          loader: ({ request }) => prefetch((qc) => qc.prefetchQuery(studiesQueryOptions(parseStudyListParams(new URL(request.url).searchParams)))),
          errorElement: <RouteError />,
        },
        {
          path: 'studies/:id',
          lazy: () => import('./routes/study-workspace.tsx'),
          loader: ({ params }) => prefetch((qc) => qc.prefetchQuery(studyQueryOptions(params.id ?? ''))),
          errorElement: <RouteError />,
        },
        {
          path: 'studies/:id/details',
          lazy: () => import('./routes/study.tsx'),
          loader: ({ params }) => prefetch((qc) => qc.prefetchQuery(studyQueryOptions(params.id ?? ''))),
          errorElement: <RouteError />,
        },
        // Review and reuse (issue 5): history, revisions, diffs, templates, notifications, audit.
        { path: 'studies/:id/history', lazy: () => import('./routes/study-history.tsx'), errorElement: <RouteError /> },
        // Phase balancing (issue 11).
        { path: 'studies/:id/balance', lazy: () => import('./routes/study-balance.tsx'), errorElement: <RouteError /> },
        { path: 'studies/:id/revisions/:n', lazy: () => import('./routes/study-revision.tsx'), errorElement: <RouteError /> },
        { path: 'studies/:id/diff', lazy: () => import('./routes/study-diff.tsx'), errorElement: <RouteError /> },
        { path: 'studies/:id/print/:n', lazy: () => import('./routes/study-print.tsx'), errorElement: <RouteError /> },
        { path: 'templates', lazy: () => import('./routes/templates.tsx'), errorElement: <RouteError /> },
        { path: 'notifications', lazy: () => import('./routes/notifications.tsx'), errorElement: <RouteError /> },
        { path: 'audit', lazy: () => import('./routes/audit.tsx'), errorElement: <RouteError /> },
        { path: 'team', lazy: () => import('./routes/team.tsx'), loader: () => prefetch((qc) => qc.prefetchQuery(teamQueryOptions())), errorElement: <RouteError /> },
        { path: 'team/mail', lazy: () => import('./routes/team-mail.tsx'), loader: () => prefetch((qc) => qc.prefetchQuery(mailQueryOptions())), errorElement: <RouteError /> },
        { path: '*', element: <NotFoundRoute /> },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}

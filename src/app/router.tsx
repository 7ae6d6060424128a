import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router';
import { RouteError } from '../components/route-error.tsx';
import { AcceptInviteRoute } from './routes/accept-invite.tsx';
import { AppLayout, AppLayoutFallback, appLayoutLoader } from './routes/app-layout.tsx';
import { NotFoundRoute } from './routes/not-found.tsx';
import { SignInRoute } from './routes/sign-in.tsx';
import { SignUpRoute } from './routes/sign-up.tsx';
import { StudiesRoute } from './routes/studies.tsx';

/** The route table; the study and team pages load on demand so the list stays light. */
export function createRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    { path: '/sign-in', element: <SignInRoute />, errorElement: <RouteError /> },
    { path: '/sign-up', element: <SignUpRoute />, errorElement: <RouteError /> },
    { path: '/invite/:token', element: <AcceptInviteRoute />, errorElement: <RouteError /> },
    {
      path: '/',
      element: <AppLayout />,
      loader: appLayoutLoader(queryClient),
      hydrateFallbackElement: <AppLayoutFallback />,
      errorElement: <RouteError />,
      children: [
        { index: true, element: <StudiesRoute />, errorElement: <RouteError /> },
        { path: 'studies/:id', lazy: () => import('./routes/study.tsx'), errorElement: <RouteError /> },
        { path: 'team', lazy: () => import('./routes/team.tsx'), errorElement: <RouteError /> },
        { path: 'team/mail', lazy: () => import('./routes/team-mail.tsx'), errorElement: <RouteError /> },
        { path: '*', element: <NotFoundRoute /> },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}

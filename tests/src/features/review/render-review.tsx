import { QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import type { ReactElement } from 'react';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { testQueryClient } from '../../helpers/render-app.tsx';

/** Renders one review component under a memory router (any path) with a fresh QueryClient, without the workspace canvas. */
export function renderReview(element: ReactElement, path = '/studies/s') {
  const queryClient = testQueryClient();
  const router = createMemoryRouter([{ path: '*', element }], { initialEntries: [path] });
  const utils = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...utils, router, queryClient };
}

import { useState, type ReactNode } from 'react';
import { Navigate } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { meQueryOptions } from '../../lib/auth.ts';

/**
 * For the sign-in and sign-up pages: someone this tab knows to be signed in (e.g. the back button
 * after signing in) goes straight to the studies. It asks the cache only, once when the page opens:
 * a request would log a 401 in the console of every signed-out visitor, and signing in on this page
 * must not redirect before the form sends the user where they were going.
 */
export function SignedOutOnly({ children }: { children: ReactNode }) {
  const queryClient = useQueryClient();
  const [signedIn] = useState(() => queryClient.getQueryData(meQueryOptions().queryKey) !== undefined);
  if (signedIn) return <Navigate to="/" replace />;
  return children;
}

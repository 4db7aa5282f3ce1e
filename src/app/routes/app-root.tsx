import type { QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs, redirect } from 'react-router-dom';
import { meQueryOptions } from '@/features/auth/api/get-me';
import { isApiError } from '@/lib/api-client';

/** Every signed-in page waits for the session; without one it goes to sign-in and back. */
export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    try {
      await queryClient.ensureQueryData(meQueryOptions());
      return null;
    } catch (error) {
      if (isApiError(error) && error.status === 401) {
        const url = new URL(request.url);
        throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
      }
      throw error;
    }
  };

export { AppLayout as AppRoot } from '@/components/layout/app-layout';

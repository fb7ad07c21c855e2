import { QueryCache, QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { RouterProvider } from 'react-router-dom';
import { ApiError, setUnauthorizedHandler } from '@/lib/api';
import { router } from './router';

const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      retry: (count, error) => !(error instanceof ApiError && error.status < 500) && count < 2,
      refetchOnWindowFocus: false,
    },
  },
  queryCache: new QueryCache(),
});

// A request refused for an ended session (ApiError.endsSession): forget cached data and go back to sign-in.
setUnauthorizedHandler(() => {
  queryClient.clear();
  const next = encodeURIComponent(window.location.pathname + window.location.search);
  router.navigate(`/sign-in?next=${next}`);
});

export function AppProviders() {
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  );
}

import { useState, type ComponentType } from 'react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';

/**
 * An island with its own query cache, so the Astro page needs no provider around it.
 * `staleTimeMs` is how long (ms) an answered page counts as fresh.
 */
export function withQueryClient<P extends object>(Body: ComponentType<P>, staleTimeMs: number): ComponentType<P> {
  return function QueryIsland(props: P) {
    const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { staleTime: staleTimeMs, retry: 1 } } }));
    return (
      <QueryClientProvider client={client}>
        <Body {...props} />
      </QueryClientProvider>
    );
  };
}

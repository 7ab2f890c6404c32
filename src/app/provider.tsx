import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { I18nextProvider } from 'react-i18next';
import { AuthProvider } from '@/lib/auth';
import { i18n } from '@/lib/i18n';
import { queryClient as defaultQueryClient } from '@/lib/query-client';

/** Everything the app needs around the router: translations, the query cache, the signed-in user. */
export function AppProvider({ children, queryClient = defaultQueryClient }: { children: ReactNode; queryClient?: QueryClient }) {
  return (
    <I18nextProvider i18n={i18n}>
      <QueryClientProvider client={queryClient}>
        <AuthProvider>{children}</AuthProvider>
      </QueryClientProvider>
    </I18nextProvider>
  );
}

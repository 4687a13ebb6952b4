/**
 * The shared render helper for component tests: wraps a screen or form in the providers the app
 * gives it (a fresh query client, the theme, and the auth provider when asked), and returns
 * Testing Library's render result with a userEvent session and the query client.
 *
 *   const { user, getByLabelText, queryClient } = setup(<MyForm />, { auth: true });
 *   await user.type(getByLabelText(/^Probe/), '36.8');
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, userEvent, type RenderOptions } from '@testing-library/react-native';
import type { ReactElement, ReactNode } from 'react';
import { AuthProvider } from '@/components/auth/auth-provider';
import { ThemeProvider } from '@/components/theme/theme-provider';

export interface SetupOptions {
  /** A query client to share between renders (a new one, without retries, when left out). */
  queryClient?: QueryClient;
  /** Wrap in the AuthProvider too (the session is read from storage, as in the app). */
  auth?: boolean;
  theme?: 'light' | 'dark';
  /** Passed to Testing Library's render. */
  render?: Omit<RenderOptions, 'wrapper'>;
}

export function testQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: { queries: { retry: false, gcTime: Infinity }, mutations: { retry: false, gcTime: Infinity } } });
}

export function Providers({ children, queryClient, auth = false, theme = 'light' }: { children: ReactNode; queryClient: QueryClient; auth?: boolean; theme?: 'light' | 'dark' }) {
  const themed = <ThemeProvider initial={theme}>{children}</ThemeProvider>;
  return <QueryClientProvider client={queryClient}>{auth ? <AuthProvider>{themed}</AuthProvider> : themed}</QueryClientProvider>;
}

export function setup(ui: ReactElement, options: SetupOptions = {}) {
  const queryClient = options.queryClient ?? testQueryClient();
  const wrapper = ({ children }: { children: ReactNode }) => (
    <Providers queryClient={queryClient} auth={options.auth} theme={options.theme}>
      {children}
    </Providers>
  );
  const user = userEvent.setup();
  const result = render(ui, { ...options.render, wrapper });
  return { user, queryClient, wrapper, ...result };
}

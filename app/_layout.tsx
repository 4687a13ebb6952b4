import { QueryClientProvider } from '@tanstack/react-query';
import { Slot } from 'expo-router';
import Head from 'expo-router/head';
import { useEffect, useState } from 'react';
import { View } from 'react-native';
import { makeQueryClient } from '@/components/api/query-client';
import { registerServiceWorker } from '@/components/offline/service-worker';
import { AuthProvider, useAuth } from '@/components/auth/auth-provider';
import { ThemeProvider, useTheme } from '@/components/theme/theme-provider';
import { useAppFonts } from '@/components/theme/use-app-fonts';
import { WebGlobalStyle } from '@/components/theme/web-global-style';

export default function RootLayout() {
  const [queryClient] = useState(makeQueryClient);
  // The fonts ship with the app; nothing is fetched from another host. On the web they never hold the first paint.
  const fontsLoaded = useAppFonts();
  // The offline worker registers once the page has loaded and the browser is idle (off the first paint).
  useEffect(registerServiceWorker, []);
  return (
    <QueryClientProvider client={queryClient}>
      <Head>
        <title>Warmfold</title>
      </Head>
      <AuthProvider>
        {/* The routes are made here, so a change of user redraws the theme, not the navigator. */}
        <ThemedRoot>{fontsLoaded ? <Slot /> : null}</ThemedRoot>
      </AuthProvider>
    </QueryClientProvider>
  );
}

function ThemedRoot({ children }: { children: React.ReactNode }) {
  const { user } = useAuth();
  return (
    <ThemeProvider key={user?.theme ?? 'system'} initial={user?.theme ?? 'system'}>
      <Background>{children}</Background>
    </ThemeProvider>
  );
}

function Background({ children }: { children: React.ReactNode }) {
  const theme = useTheme();
  return (
    <View style={{ flex: 1, backgroundColor: theme.colors.background }}>
      <WebGlobalStyle theme={theme} />
      {children}
    </View>
  );
}

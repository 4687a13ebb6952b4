import { Inter_400Regular } from '@expo-google-fonts/inter/400Regular';
import { Inter_500Medium } from '@expo-google-fonts/inter/500Medium';
import { Inter_600SemiBold } from '@expo-google-fonts/inter/600SemiBold';
import { Inter_700Bold } from '@expo-google-fonts/inter/700Bold';
import { QueryClientProvider } from '@tanstack/react-query';
import { useFonts } from 'expo-font';
import { Slot } from 'expo-router';
import { useState } from 'react';
import { View } from 'react-native';
import { makeQueryClient } from '@/components/api/query-client';
import { AuthProvider, useAuth } from '@/components/auth/auth-provider';
import { ThemeProvider, useTheme } from '@/components/theme/theme-provider';

export default function RootLayout() {
  const [queryClient] = useState(makeQueryClient);
  // The fonts ship inside the bundle; nothing is fetched from another host.
  const [fontsLoaded] = useFonts({ Inter_400Regular, Inter_500Medium, Inter_600SemiBold, Inter_700Bold });
  return (
    <QueryClientProvider client={queryClient}>
      <AuthProvider>
        <ThemedRoot ready={fontsLoaded} />
      </AuthProvider>
    </QueryClientProvider>
  );
}

function ThemedRoot({ ready }: { ready: boolean }) {
  const { user } = useAuth();
  return (
    <ThemeProvider key={user?.theme ?? 'system'} initial={user?.theme ?? 'system'}>
      <Background>{ready ? <Slot /> : null}</Background>
    </ThemeProvider>
  );
}

function Background({ children }: { children: React.ReactNode }) {
  const theme = useTheme();
  return <View style={{ flex: 1, backgroundColor: theme.colors.background }}>{children}</View>;
}

import { createContext, useContext, type ReactNode } from 'react';
import { RefreshControl, ScrollView, StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from './text';

export interface ScreenProps {
  title: string;
  subtitle?: string;
  actions?: ReactNode;
  children: ReactNode;
  refreshing?: boolean;
  onRefresh?: () => void;
  /** Wide content (the board, grids) may use the full width. */
  wide?: boolean;
}

const InScreen = createContext(false);

/** True under a Screen, whose title is already the page's level-1 heading. */
export function useInScreen(): boolean {
  return useContext(InScreen);
}

/** A scrolling page with a heading; pull to refresh where the screen supports it. */
export function Screen({ title, subtitle, actions, children, refreshing, onRefresh, wide }: ScreenProps) {
  const theme = useTheme();
  return (
    <ScrollView
      // The page scrolls with the arrow keys even when it holds no control (a mailbox, a report).
      tabIndex={0}
      style={{ backgroundColor: theme.colors.background }}
      contentContainerStyle={[styles.content, !wide && styles.narrow]}
      refreshControl={onRefresh ? <RefreshControl refreshing={!!refreshing} onRefresh={onRefresh} tintColor={theme.colors.primary} /> : undefined}
    >
      <View style={styles.header}>
        <View style={styles.titles}>
          <Text variant="heading" role="heading" aria-level={1}>
            {title}
          </Text>
          {subtitle ? <Text tone="muted">{subtitle}</Text> : null}
        </View>
        {actions ? <View style={styles.actions}>{actions}</View> : null}
      </View>
      <InScreen.Provider value>{children}</InScreen.Provider>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  content: { padding: 16, gap: 16, paddingBottom: 48 },
  narrow: { maxWidth: 960, width: '100%', alignSelf: 'center' },
  header: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end', justifyContent: 'space-between', gap: 12 },
  titles: { gap: 4, flexShrink: 1 },
  actions: { flexDirection: 'row', gap: 8, flexWrap: 'wrap' },
});

import { router, usePathname } from 'expo-router';
import type { ReactNode } from 'react';
import { Pressable, StyleSheet, View, useWindowDimensions } from 'react-native';
import { ROLE_LABELS } from '@/shared/roles';
import { useUser } from '@/components/auth/auth-provider';
import { TOUCH_TARGET, WIDE_BREAKPOINT } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Icon } from '@/components/ui/icon';
import { Text } from '@/components/ui/text';
import { ConnectionBanner } from './connection-banner';
import { SignOutDialog, useSignOut } from './sign-out';
import { UpdateBanner } from '@/components/offline/update-banner';
import { navItemsFor, type NavItem } from './nav-items';

/** Bottom tabs on a phone, a side rail from 1024 px. */
export function AppShell({ children }: { children: ReactNode }) {
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const theme = useTheme();
  const user = useUser();
  const signOut = useSignOut();
  const items = navItemsFor(user.role);
  const c = theme.colors;

  if (wide) {
    return (
      <View style={[styles.wideRoot, { backgroundColor: c.background }]}>
        <View style={[styles.rail, { backgroundColor: c.surface, borderRightColor: c.border }]} role="navigation" aria-label="Main">
          <View style={styles.brand}>
            <Text variant="title" tone="primary" role="none">
              Warmfold
            </Text>
            <Text variant="caption" tone="muted">
              {user.name} · {ROLE_LABELS[user.role]}
            </Text>
          </View>
          {items.map((item) => (
            <NavLink key={item.href} item={item} layout="rail" />
          ))}
          <View style={styles.spacer} />
          <Pressable role="button" aria-label="Sign out" onPress={signOut} style={styles.railItem}>
            <Icon name="out" color={c.textMuted} />
            <Text tone="muted" variant="label">
              Sign out
            </Text>
          </Pressable>
        </View>
        <View style={styles.main} role="main">
          <ConnectionBanner />
          <UpdateBanner />
          {children}
        </View>
        <SignOutDialog />
      </View>
    );
  }
  return (
    <View style={[styles.narrowRoot, { backgroundColor: c.background }]}>
      <View style={styles.main} role="main">
        <ConnectionBanner />
        <UpdateBanner />
        {children}
      </View>
      <View style={[styles.tabs, { backgroundColor: c.surface, borderTopColor: c.border }]} role="navigation" aria-label="Main">
        {items.map((item) => (
          <NavLink key={item.href} item={item} layout="tabs" />
        ))}
      </View>
      <SignOutDialog />
    </View>
  );
}

function NavLink({ item, layout }: { item: NavItem; layout: 'rail' | 'tabs' }) {
  const pathname = usePathname();
  const theme = useTheme();
  const active = pathname === item.href || pathname.startsWith(`${item.href}/`);
  const color = active ? theme.colors.primary : theme.colors.textMuted;
  return (
    <Pressable
      role="link"
      // react-native-web renders an <a href>, so the link works with a middle click and a screen reader.
      {...({ href: item.href } as object)}
      accessibilityLabel={item.label}
      aria-current={active ? 'page' : undefined}
      onPress={(e) => {
        e.preventDefault?.();
        router.push(item.href);
      }}
      style={[layout === 'rail' ? styles.railItem : styles.tabItem, active && { backgroundColor: theme.colors.primarySoft }]}
    >
      <Icon name={item.icon} color={color} size={layout === 'rail' ? 22 : 24} />
      <Text variant={layout === 'rail' ? 'label' : 'caption'} style={{ color }}>
        {item.label}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  wideRoot: { flex: 1, flexDirection: 'row', minHeight: '100%' as unknown as number },
  narrowRoot: { flex: 1, minHeight: '100%' as unknown as number },
  rail: { width: 232, borderRightWidth: 1, paddingVertical: 16, paddingHorizontal: 10, gap: 4 },
  brand: { paddingHorizontal: 10, paddingBottom: 16, gap: 2 },
  railItem: { flexDirection: 'row', alignItems: 'center', gap: 12, minHeight: TOUCH_TARGET, paddingHorizontal: 12, borderRadius: 10 },
  spacer: { flex: 1 },
  main: { flex: 1 },
  tabs: { flexDirection: 'row', borderTopWidth: 1, paddingBottom: 4 },
  tabItem: { flex: 1, alignItems: 'center', justifyContent: 'center', minHeight: 56, gap: 2, borderRadius: 10, margin: 2 },
});

/**
 * The part of Expo Router's public API that Warmfold's screens use, imported from the modules
 * that define it. metro.config.js points the web build's `expo-router` imports from app code
 * here, so the first page does not also carry the stack, tab, header and icon views that the
 * package index names but Warmfold never renders. Names and behaviour are Expo Router's own.
 */
export { Slot } from 'expo-router/build/views/Navigator';
export { Link, Redirect } from 'expo-router/build/link/Link';
export { router } from 'expo-router/build/imperative-api';
export { useLocalSearchParams, usePathname, useRouter } from 'expo-router/build/hooks';

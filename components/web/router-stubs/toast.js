// Web build only (metro.config.js): Expo Router's toast, shown while a route bundles in
// development or when a route file lacks its default export. The same message without the
// fade-in, so the Animated library stays out of the first page.
const { jsx, jsxs } = require('react/jsx-runtime');
const { Platform, StyleSheet, Text, View } = require('react-native');

exports.CODE_FONT = Platform.select({ default: 'Courier', ios: 'Courier New', android: 'monospace' });

exports.ToastWrapper = function ToastWrapper({ children }) {
  return jsx(View, { style: styles.container, pointerEvents: 'box-none', children });
};

exports.Toast = function Toast({ children, filename, warning }) {
  return jsxs(View, {
    role: warning ? 'alert' : 'status',
    style: [styles.toast, warning && styles.warning],
    children: [jsx(Text, { style: styles.text, children }), filename ? jsx(Text, { style: styles.filename, children: filename }) : null],
  });
};

const styles = StyleSheet.create({
  container: { position: 'absolute', top: 0, left: 0, right: 0, bottom: 0, alignItems: 'center', justifyContent: 'flex-end', padding: 24 },
  toast: { backgroundColor: '#1F2A2E', borderRadius: 8, paddingVertical: 10, paddingHorizontal: 14, maxWidth: 480 },
  warning: { backgroundColor: '#7A2E12' },
  text: { color: '#FFFFFF', fontSize: 14 },
  filename: { color: '#D8E2E4', fontSize: 12, fontFamily: exports.CODE_FONT },
});

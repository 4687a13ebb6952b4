// Web build only (metro.config.js): Expo Router sets react-native-screens' flags for native
// screens at start-up. The web has no native screens, so there is nothing to set, and
// react-native-screens (with the Animated library it loads) stays out of the bundle.
exports.initScreensFeatureFlags = function initScreensFeatureFlags() {};

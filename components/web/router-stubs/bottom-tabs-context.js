// Web build only (metro.config.js): Expo Router's error and toast views ask whether they sit in a
// bottom tab bar. Warmfold has no tab navigator, so the answer is always "no" (undefined), and the
// tab bar's views stay out of the bundle.
const { createContext } = require('react');

exports.BottomTabBarHeightContext = createContext(undefined);

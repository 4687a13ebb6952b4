// Expo's Metro defaults, with five changes for the web build only (and .woff2 files as assets):
// - zod's table of ~50 languages is replaced by its English messages (components/web/zod-locales-en.ts).
//   Warmfold's messages are its own, in English; the other languages were a fifth of the first
//   page's JavaScript.
// - the screens' `import … from 'expo-router'` goes to components/web/expo-router-slim.ts, which
//   re-exports the few names they use from the modules that define them, so the package index's
//   stack, tab and icon views stay out of the first page.
// - four parts of Expo Router that cannot run here (the route-listing page, which app.json switches
//   off; iOS link previews; native tabs; the tab bar's height context) get inert stand-ins
//   (components/web/router-stubs/).
// - the app's and Expo's `react-native` imports get components/web/react-native-slim.js, which
//   leaves out what no first page uses (Animated, virtualised lists, Touchables).
// - requires are inlined (below).
// tests/shared/web-build.test.ts checks all five.
const path = require('node:path');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
// The web app's Inter subsets (scripts/web-fonts.mjs) are WOFF2 files.
config.resolver.assetExts = [...config.resolver.assetExts, 'woff2'];
const ZOD_LOCALES = /[\\/]node_modules[\\/]zod[\\/]v4[\\/]locales[\\/]index\.c?js$/;
const EN_ONLY = path.join(__dirname, 'components', 'web', 'zod-locales-en.ts');

const ROUTER_SLIM = path.join(__dirname, 'components', 'web', 'expo-router-slim.ts');
const IN_NODE_MODULES = /[\\/]node_modules[\\/]/;

// Parts of Expo Router that cannot run in Warmfold's web app, replaced by inert stand-ins: see
// components/web/router-stubs/list.js.
const { ROUTER_STUBS } = require('./components/web/router-stubs/list.js');

// react-native for the first page: the app's and Expo's imports get components/web/react-native-slim.js
// (react-native-web without Animated, the virtualised lists and the Touchables); every other
// package, such as the charts, which load later, gets react-native-web whole.
const RN_SLIM = path.join(__dirname, 'components', 'web', 'react-native-slim.js');
const RN_SLIM_ORIGINS = /[\\/]node_modules[\\/](expo|expo-[^\\/]+|@expo[\\/][^\\/]+|react-native-safe-area-context)[\\/]/;
// babel-preset-expo has already turned `react-native` into react-native-web's index by now.
const REACT_NATIVE = /^(react-native|react-native-web|react-native-web\/dist\/(index|cjs\/index)(\.js)?)$/;
// The static export also bundles the app for Node to render the pages; that bundle keeps the
// whole library (it is never sent to a browser).
const onServer = (context) => ['node', 'react-server'].includes(context.customResolverOptions?.environment);
const wantsSlimReactNative = (origin) => !IN_NODE_MODULES.test(origin) || RN_SLIM_ORIGINS.test(origin);

const upstream = config.resolver.resolveRequest;
config.resolver.resolveRequest = (context, moduleName, platform) => {
  if (platform === 'web' && moduleName === 'expo-router' && !IN_NODE_MODULES.test(context.originModulePath)) {
    return { type: 'sourceFile', filePath: ROUTER_SLIM };
  }
  if (
    platform === 'web' &&
    !onServer(context) &&
    REACT_NATIVE.test(moduleName) &&
    context.originModulePath &&
    wantsSlimReactNative(context.originModulePath) &&
    context.originModulePath !== RN_SLIM
  ) {
    return { type: 'sourceFile', filePath: RN_SLIM };
  }
  const resolved = upstream ? upstream(context, moduleName, platform) : context.resolveRequest(context, moduleName, platform);
  if (platform === 'web' && resolved.type === 'sourceFile' && ZOD_LOCALES.test(resolved.filePath)) {
    return { type: 'sourceFile', filePath: EN_ONLY };
  }
  if (platform === 'web' && resolved.type === 'sourceFile') {
    const stub = ROUTER_STUBS.find((s) => s.file === resolved.filePath && (!s.from || s.from.includes(context.originModulePath)));
    if (stub) return { type: 'sourceFile', filePath: stub.stub };
  }
  return resolved;
};

// Inline requires (React Native's own default for release builds): a module runs when one of its
// exports is first used, not when the file importing it loads, so a page's start-up does not
// run the code of screens and features it has not opened.
const upstreamTransformOptions = config.transformer.getTransformOptions;
config.transformer.getTransformOptions = async (entryPoints, options, getDependencies) => {
  const base = upstreamTransformOptions ? await upstreamTransformOptions(entryPoints, options, getDependencies) : {};
  if (options.platform !== 'web') return base;
  return { ...base, transform: { ...base.transform, inlineRequires: true } };
};

module.exports = config;

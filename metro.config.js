// Expo's Metro defaults, with two changes for the web build only:
// - zod's table of ~50 languages is replaced by its English messages (components/web/zod-locales-en.ts).
//   Warmfold's messages are its own, in English; the other languages were a fifth of the first
//   page's JavaScript.
// - the screens' `import … from 'expo-router'` goes to components/web/expo-router-slim.ts, which
//   re-exports the few names they use from the modules that define them, so the package index's
//   stack, tab and icon views stay out of the first page. Expo Router's own modules are untouched.
// tests/shared/web-build.test.ts checks both.
const path = require('node:path');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
const ZOD_LOCALES = /[\\/]node_modules[\\/]zod[\\/]v4[\\/]locales[\\/]index\.c?js$/;
const EN_ONLY = path.join(__dirname, 'components', 'web', 'zod-locales-en.ts');

const ROUTER_SLIM = path.join(__dirname, 'components', 'web', 'expo-router-slim.ts');
const IN_NODE_MODULES = /[\\/]node_modules[\\/]/;

const upstream = config.resolver.resolveRequest;
config.resolver.resolveRequest = (context, moduleName, platform) => {
  if (platform === 'web' && moduleName === 'expo-router' && !IN_NODE_MODULES.test(context.originModulePath)) {
    return { type: 'sourceFile', filePath: ROUTER_SLIM };
  }
  const resolved = upstream ? upstream(context, moduleName, platform) : context.resolveRequest(context, moduleName, platform);
  if (platform === 'web' && resolved.type === 'sourceFile' && ZOD_LOCALES.test(resolved.filePath)) {
    return { type: 'sourceFile', filePath: EN_ONLY };
  }
  return resolved;
};

module.exports = config;

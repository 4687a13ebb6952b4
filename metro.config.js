// Expo's Metro defaults, with one change for the web build: zod's table of ~50 languages is
// replaced by its English messages only (components/web/zod-locales-en.ts). Warmfold's messages are
// its own, in English; the other languages were a fifth of the first page's JavaScript.
const path = require('node:path');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
const ZOD_LOCALES = /[\\/]node_modules[\\/]zod[\\/]v4[\\/]locales[\\/]index\.c?js$/;
const EN_ONLY = path.join(__dirname, 'components', 'web', 'zod-locales-en.ts');

const upstream = config.resolver.resolveRequest;
config.resolver.resolveRequest = (context, moduleName, platform) => {
  const resolved = upstream ? upstream(context, moduleName, platform) : context.resolveRequest(context, moduleName, platform);
  if (platform === 'web' && resolved.type === 'sourceFile' && ZOD_LOCALES.test(resolved.filePath)) {
    return { type: 'sourceFile', filePath: EN_ONLY };
  }
  return resolved;
};

module.exports = config;

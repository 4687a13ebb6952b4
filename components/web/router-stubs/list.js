// Parts of Expo Router that cannot run in Warmfold's web app, and the inert stand-ins the web
// build uses instead (metro.config.js). Keyed by the file Metro resolved, and for the tab context
// also by who asked, so nothing else changes. tests/shared/web-build.test.ts checks that each
// stand-in still provides every name its importers read, so an Expo Router upgrade that starts
// using more of one fails the tests rather than the page.
const path = require('node:path');

const ROUTER_BUILD = path.join(__dirname, '..', '..', '..', 'node_modules', 'expo-router', 'build');

exports.ROUTER_BUILD = ROUTER_BUILD;
exports.ROUTER_STUBS = [
  { file: path.join(ROUTER_BUILD, 'views', 'Sitemap.js'), stub: path.join(__dirname, 'sitemap.js') },
  { file: path.join(ROUTER_BUILD, 'link', 'LinkWithPreview.js'), stub: path.join(__dirname, 'link-with-preview.js') },
  { file: path.join(ROUTER_BUILD, 'native-tabs', 'NativeTabTrigger.js'), stub: path.join(__dirname, 'native-tab-trigger.js') },
  {
    file: path.join(ROUTER_BUILD, 'react-navigation', 'bottom-tabs', 'index.js'),
    from: [path.join(ROUTER_BUILD, 'views', 'ErrorBoundary.js'), path.join(ROUTER_BUILD, 'views', 'Toast.js')],
    stub: path.join(__dirname, 'bottom-tabs-context.js'),
  },
  {
    file: path.join(ROUTER_BUILD, 'fork', 'native-stack', 'createNativeStackNavigator.js'),
    from: [path.join(ROUTER_BUILD, 'layouts', 'StackClient.js')],
    stub: path.join(__dirname, 'native-stack.js'),
  },
  {
    file: path.join(ROUTER_BUILD, 'layouts', 'stack-utils', 'index.js'),
    from: [path.join(ROUTER_BUILD, 'layouts', 'StackClient.js')],
    stub: path.join(__dirname, 'stack-utils.js'),
  },
  { file: path.join(ROUTER_BUILD, 'screensFeatureFlags.js'), stub: path.join(__dirname, 'screens-feature-flags.js') },
  { file: path.join(ROUTER_BUILD, 'views', 'Toast.js'), stub: path.join(__dirname, 'toast.js') },
];

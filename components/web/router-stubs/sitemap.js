// Web build only (metro.config.js): the route-listing page is switched off in app.json
// ("sitemap": false), so Expo Router never renders it; this keeps its view out of the bundle.
exports.Sitemap = function Sitemap() {
  return null;
};
exports.getNavOptions = function getNavOptions() {
  return {};
};

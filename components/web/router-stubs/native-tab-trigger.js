// Web build only (metro.config.js): native tabs are an iOS and Android layout; Warmfold has none,
// so no child of a layout is ever a native tab trigger.
exports.NativeTabTrigger = function NativeTabTrigger() {
  return null;
};
exports.isNativeTabTrigger = function isNativeTabTrigger() {
  return false;
};
exports.convertTabPropsToOptions = function convertTabPropsToOptions() {
  return {};
};

// Web build only (metro.config.js): Expo Router renders link previews on iOS alone.
exports.LinkWithPreview = function LinkWithPreview() {
  return null;
};

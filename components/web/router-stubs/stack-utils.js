// Web build only (metro.config.js): the Stack layout's screen, header and toolbar helpers. No
// Stack is rendered in Warmfold (its layouts are Slots), so these are never called.
function NotUsed() {
  return null;
}

exports.StackHeader = NotUsed;
exports.StackScreen = NotUsed;
exports.StackSearchBar = NotUsed;
exports.StackTitle = NotUsed;
exports.StackToolbar = NotUsed;
exports.appendScreenStackPropsToOptions = function appendScreenStackPropsToOptions(options) {
  return options;
};
exports.mapProtectedScreen = function mapProtectedScreen(props) {
  return props;
};
exports.validateStackPresentation = function validateStackPresentation(options) {
  return options;
};

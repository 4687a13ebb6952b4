// Web build only (metro.config.js): Expo Router's Stack layout. Warmfold's layouts are Slots, so
// no Stack is ever rendered; its module is still loaded for the router it defines (which Slot
// uses), and this keeps the native stack's views and headers out of the bundle.
function NotUsed() {
  return null;
}

exports.createNativeStackNavigator = function createNativeStackNavigator() {
  return { Navigator: NotUsed, Screen: NotUsed, Group: NotUsed };
};

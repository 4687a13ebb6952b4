/**
 * react-native for the first page of Warmfold's web build (metro.config.js sends the app's and
 * Expo's `react-native` imports here). react-native-web's index names every component it has, and
 * a CommonJS `require('react-native')` keeps them all, so the first page carried Animated, the
 * virtualised lists, the Touchables and more that nothing on it uses. This module names the rest,
 * from the files that define them. The left-out names answer with a clear error if anything reads
 * them (not enumerable, so copying the module's names does not trip them); the chart packages,
 * which load later, get the whole library. tests/shared/web-build.test.ts checks the lists.
 */
'use strict';

exports.unstable_createElement = require('react-native-web/dist/exports/createElement').default;
exports.findNodeHandle = require('react-native-web/dist/exports/findNodeHandle').default;
exports.processColor = require('react-native-web/dist/exports/processColor').default;
exports.render = require('react-native-web/dist/exports/render').default;
exports.unmountComponentAtNode = require('react-native-web/dist/exports/unmountComponentAtNode').default;
exports.NativeModules = require('react-native-web/dist/exports/NativeModules').default;
exports.AccessibilityInfo = require('react-native-web/dist/exports/AccessibilityInfo').default;
exports.Alert = require('react-native-web/dist/exports/Alert').default;
exports.Appearance = require('react-native-web/dist/exports/Appearance').default;
exports.AppRegistry = require('react-native-web/dist/exports/AppRegistry').default;
exports.AppState = require('react-native-web/dist/exports/AppState').default;
exports.AssetRegistry = require('react-native-web/dist/exports/AssetRegistry').default;
exports.BackHandler = require('react-native-web/dist/exports/BackHandler').default;
exports.Dimensions = require('react-native-web/dist/exports/Dimensions').default;
exports.Easing = require('react-native-web/dist/exports/Easing').default;
exports.I18nManager = require('react-native-web/dist/exports/I18nManager').default;
exports.Keyboard = require('react-native-web/dist/exports/Keyboard').default;
exports.InteractionManager = require('react-native-web/dist/exports/InteractionManager').default;
exports.Linking = require('react-native-web/dist/exports/Linking').default;
exports.NativeEventEmitter = require('react-native-web/dist/exports/NativeEventEmitter').default;
exports.PixelRatio = require('react-native-web/dist/exports/PixelRatio').default;
exports.Platform = require('react-native-web/dist/exports/Platform').default;
exports.StyleSheet = require('react-native-web/dist/exports/StyleSheet').default;
exports.UIManager = require('react-native-web/dist/exports/UIManager').default;
exports.ActivityIndicator = require('react-native-web/dist/exports/ActivityIndicator').default;
exports.Image = require('react-native-web/dist/exports/Image').default;
exports.KeyboardAvoidingView = require('react-native-web/dist/exports/KeyboardAvoidingView').default;
exports.Modal = require('react-native-web/dist/exports/Modal').default;
exports.Pressable = require('react-native-web/dist/exports/Pressable').default;
exports.RefreshControl = require('react-native-web/dist/exports/RefreshControl').default;
exports.SafeAreaView = require('react-native-web/dist/exports/SafeAreaView').default;
exports.ScrollView = require('react-native-web/dist/exports/ScrollView').default;
exports.StatusBar = require('react-native-web/dist/exports/StatusBar').default;
exports.Text = require('react-native-web/dist/exports/Text').default;
exports.TextInput = require('react-native-web/dist/exports/TextInput').default;
exports.View = require('react-native-web/dist/exports/View').default;
exports.DeviceEventEmitter = require('react-native-web/dist/exports/DeviceEventEmitter').default;
exports.useColorScheme = require('react-native-web/dist/exports/useColorScheme').default;
exports.useLocaleContext = require('react-native-web/dist/exports/useLocaleContext').default;
exports.useWindowDimensions = require('react-native-web/dist/exports/useWindowDimensions').default;

/** Not in the first page's build: see the comment at the top. */
const LEFT_OUT = [
  'Animated',
  'Clipboard',
  'LayoutAnimation',
  'PanResponder',
  'Share',
  'Vibration',
  'Button',
  'CheckBox',
  'FlatList',
  'ImageBackground',
  'InputAccessoryView',
  'Picker',
  'ProgressBar',
  'SectionList',
  'Switch',
  'Touchable',
  'TouchableHighlight',
  'TouchableNativeFeedback',
  'TouchableOpacity',
  'TouchableWithoutFeedback',
  'VirtualizedList',
  'YellowBox',
  'LogBox',
];
for (const name of LEFT_OUT) {
  Object.defineProperty(exports, name, {
    enumerable: false,
    get() {
      throw new Error(
        `react-native's ${name} is left out of Warmfold's first-page web build (components/web/react-native-slim.js); import it from a lazily loaded module, or take it off the list.`,
      );
    },
  });
}
Object.defineProperty(exports, '__warmfoldLeftOut', { enumerable: false, value: LEFT_OUT });

import { Platform, type TextStyle } from 'react-native';

/**
 * Warmfold's look: warm paper by day, a low-glare slate at night. Semantic names only; the
 * palette below them is private. Every status colour is paired with a word and an icon.
 * Text colours meet 4.5:1 against their surfaces in both themes; borders, status shapes and the
 * focus ring meet 3:1 against every surface they sit on (tests/e2e/a11y.e2e.ts checks the screens).
 */
const palette = {
  paper: '#F7F4EF',
  paperRaised: '#FFFFFF',
  paperSunken: '#EDE8E0',
  ink: '#1C2326',
  inkSoft: '#4A5458',
  line: '#757E82',
  teal900: '#0F3C44',
  teal700: '#1C5963',
  teal200: '#BFDCE0',
  teal100: '#E1EFF1',
  ember700: '#9C3D0F',
  ember100: '#FBE6DA',
  amber800: '#7A4E00',
  amber100: '#FFF0CF',
  moss700: '#2B6436',
  moss100: '#E2F1E4',
  plum700: '#5B3A7A',
  plum100: '#EEE6F6',
  crimson700: '#A12622',
  crimson100: '#FBE3E1',

  night: '#11181B',
  nightRaised: '#1A2327',
  nightSunken: '#0B1012',
  nightInk: '#E7ECEC',
  nightInkSoft: '#A9B4B6',
  nightLine: '#6B777A',
  nightTeal: '#7CC4CE',
  nightTealSoft: '#1D3A40',
  nightEmber: '#F3A27A',
  nightEmberSoft: '#43271B',
  nightAmber: '#F2C76B',
  nightAmberSoft: '#3C3118',
  nightMoss: '#8FD39B',
  nightMossSoft: '#1D3522',
  nightPlum: '#CDB2EA',
  nightPlumSoft: '#33283F',
  nightCrimson: '#FF9A92',
  nightCrimsonSoft: '#45201E',
} as const;

export interface ThemeColors {
  /** The page behind everything. */
  background: string;
  /** Cards, rows, sheets. */
  surface: string;
  /** Inputs and inset areas. */
  surfaceSunken: string;
  text: string;
  textMuted: string;
  /** Borders and dividers that must stay visible (3:1 against the surface). */
  border: string;
  primary: string;
  onPrimary: string;
  primarySoft: string;
  focus: string;
  /** Overdue checks, open gap flags, refusals. */
  danger: string;
  dangerSoft: string;
  /** Due soon, confirmations. */
  warning: string;
  warningSoft: string;
  /** On time, closed flags. */
  ok: string;
  okSoft: string;
  /** Heat stress. */
  heat: string;
  heatSoft: string;
  /** Skin-to-skin sessions. */
  together: string;
  togetherSoft: string;
  /** Chart series. */
  seriesProbe: string;
  seriesRemote: string;
  seriesSet: string;
  band: string;
}

export const lightColors: ThemeColors = {
  background: palette.paper,
  surface: palette.paperRaised,
  surfaceSunken: palette.paperSunken,
  text: palette.ink,
  textMuted: palette.inkSoft,
  border: palette.line,
  primary: palette.teal700,
  onPrimary: '#FFFFFF',
  primarySoft: palette.teal100,
  focus: palette.teal900,
  danger: palette.crimson700,
  dangerSoft: palette.crimson100,
  warning: palette.amber800,
  warningSoft: palette.amber100,
  ok: palette.moss700,
  okSoft: palette.moss100,
  heat: palette.ember700,
  heatSoft: palette.ember100,
  together: palette.plum700,
  togetherSoft: palette.plum100,
  seriesProbe: palette.teal700,
  seriesRemote: palette.ember700,
  seriesSet: palette.inkSoft,
  band: palette.moss100,
};

export const darkColors: ThemeColors = {
  background: palette.night,
  surface: palette.nightRaised,
  surfaceSunken: palette.nightSunken,
  text: palette.nightInk,
  textMuted: palette.nightInkSoft,
  border: palette.nightLine,
  primary: palette.nightTeal,
  onPrimary: palette.nightSunken,
  primarySoft: palette.nightTealSoft,
  focus: palette.nightTeal,
  danger: palette.nightCrimson,
  dangerSoft: palette.nightCrimsonSoft,
  warning: palette.nightAmber,
  warningSoft: palette.nightAmberSoft,
  ok: palette.nightMoss,
  okSoft: palette.nightMossSoft,
  heat: palette.nightEmber,
  heatSoft: palette.nightEmberSoft,
  together: palette.nightPlum,
  togetherSoft: palette.nightPlumSoft,
  seriesProbe: palette.nightTeal,
  seriesRemote: palette.nightEmber,
  seriesSet: palette.nightInkSoft,
  band: palette.nightMossSoft,
};

export const spacing = { xxs: 2, xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32, xxxl: 48 } as const;

export const radii = { sm: 6, md: 10, lg: 16, pill: 999 } as const;

/**
 * On the web, Inter is one family with four weights (declared in use-app-fonts.web.ts), backed
 * by the system's sans-serif at the same weight until Inter is at hand.
 */
export const WEB_FONT_FAMILY = 'Inter, system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif';

type Face = { fontFamily: string; fontWeight?: TextStyle['fontWeight'] };
const face = (weight: '400' | '500' | '600' | '700', nativeName: string): Face =>
  Platform.OS === 'web' ? { fontFamily: WEB_FONT_FAMILY, fontWeight: weight } : { fontFamily: nativeName };

/** Spread into a text style: `{ ...fonts.bold }`. */
export const fonts = {
  regular: face('400', 'Inter_400Regular'),
  medium: face('500', 'Inter_500Medium'),
  semibold: face('600', 'Inter_600SemiBold'),
  bold: face('700', 'Inter_700Bold'),
};

export const type = {
  caption: { fontSize: 13, lineHeight: 18, ...fonts.medium },
  body: { fontSize: 16, lineHeight: 24, ...fonts.regular },
  bodyStrong: { fontSize: 16, lineHeight: 24, ...fonts.semibold },
  label: { fontSize: 15, lineHeight: 20, ...fonts.semibold },
  title: { fontSize: 20, lineHeight: 28, ...fonts.semibold },
  heading: { fontSize: 26, lineHeight: 32, ...fonts.bold },
  /** Values read from across a room on the board. */
  display: { fontSize: 34, lineHeight: 40, ...fonts.bold },
} as const;

/** Minimum touch target, in points (WCAG 2.5.5 asks 44). */
export const TOUCH_TARGET = 48;

/** Wide screens get a side rail instead of bottom tabs. */
export const WIDE_BREAKPOINT = 1024;

export interface Theme {
  name: 'light' | 'dark';
  colors: ThemeColors;
  spacing: typeof spacing;
  radii: typeof radii;
  type: typeof type;
  fonts: typeof fonts;
}

export const lightTheme: Theme = { name: 'light', colors: lightColors, spacing, radii, type, fonts };
export const darkTheme: Theme = { name: 'dark', colors: darkColors, spacing, radii, type, fonts };

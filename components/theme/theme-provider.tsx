import { createContext, useContext, useEffect, useMemo, useState, useSyncExternalStore, type ReactNode } from 'react';
import { Appearance } from 'react-native';
import { darkTheme, lightTheme, type Theme } from './theme';

export type ThemeChoice = 'system' | 'light' | 'dark';

interface ThemeState {
  theme: Theme;
  choice: ThemeChoice;
  setChoice: (choice: ThemeChoice) => void;
  setNightScreen: (night: boolean) => void;
}

const ThemeContext = createContext<ThemeState>({ theme: lightTheme, choice: 'system', setChoice: () => {}, setNightScreen: () => {} });

/**
 * The theme follows the device unless the user chose one in Settings. A screen may ask for the
 * night theme while it is shown (the board on a night shift); a user's own choice always wins.
 */
export function ThemeProvider({ children, initial = 'system' }: { children: ReactNode; initial?: ThemeChoice }) {
  // Not useColorScheme(): react-native-web's reads the media query in its first render, which
  // differs from the statically rendered (light) HTML on a dark device. React does not patch
  // mismatched attributes when hydrating, so the page would keep the light colours.
  const system = useSyncExternalStore(
    subscribeScheme,
    () => Appearance.getColorScheme(),
    () => 'light' as const,
  );
  const [choice, setChoice] = useState<ThemeChoice>(initial);
  const [nightScreen, setNightScreen] = useState(false);
  const value = useMemo(() => {
    const dark = choice === 'dark' || (choice === 'system' && (system === 'dark' || nightScreen));
    return { theme: dark ? darkTheme : lightTheme, choice, setChoice, setNightScreen };
  }, [choice, system, nightScreen]);
  return <ThemeContext.Provider value={value}>{children}</ThemeContext.Provider>;
}

function subscribeScheme(onChange: () => void): () => void {
  const sub = Appearance.addChangeListener(onChange);
  return () => sub.remove();
}

export function useTheme(): Theme {
  return useContext(ThemeContext).theme;
}

export function useThemeChoice(): Pick<ThemeState, 'choice' | 'setChoice'> {
  const { choice, setChoice } = useContext(ThemeContext);
  return { choice, setChoice };
}

/** While the calling screen is shown, use the night theme when `night` (unless the user chose a theme). */
export function useNightScreen(night: boolean): void {
  const { setNightScreen } = useContext(ThemeContext);
  useEffect(() => {
    setNightScreen(night);
    return () => setNightScreen(false);
  }, [night, setNightScreen]);
}

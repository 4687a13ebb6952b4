import { createContext, useContext, useMemo, useState, type ReactNode } from 'react';
import { useColorScheme } from 'react-native';
import { darkTheme, lightTheme, type Theme } from './theme';

export type ThemeChoice = 'system' | 'light' | 'dark';

interface ThemeState {
  theme: Theme;
  choice: ThemeChoice;
  setChoice: (choice: ThemeChoice) => void;
}

const ThemeContext = createContext<ThemeState>({ theme: lightTheme, choice: 'system', setChoice: () => {} });

export function ThemeProvider({ children, initial = 'system' }: { children: ReactNode; initial?: ThemeChoice }) {
  const system = useColorScheme();
  const [choice, setChoice] = useState<ThemeChoice>(initial);
  const value = useMemo(() => {
    const dark = choice === 'dark' || (choice === 'system' && system === 'dark');
    return { theme: dark ? darkTheme : lightTheme, choice, setChoice };
  }, [choice, system]);
  return <ThemeContext.Provider value={value}>{children}</ThemeContext.Provider>;
}

export function useTheme(): Theme {
  return useContext(ThemeContext).theme;
}

export function useThemeChoice(): Pick<ThemeState, 'choice' | 'setChoice'> {
  const { choice, setChoice } = useContext(ThemeContext);
  return { choice, setChoice };
}

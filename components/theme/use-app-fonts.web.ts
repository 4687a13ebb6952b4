import { Inter_400Regular } from '@expo-google-fonts/inter/400Regular';
import { Inter_500Medium } from '@expo-google-fonts/inter/500Medium';
import { Inter_600SemiBold } from '@expo-google-fonts/inter/600SemiBold';
import { Inter_700Bold } from '@expo-google-fonts/inter/700Bold';
import { FontDisplay, useFonts } from 'expo-font';

const fallback = (uri: string | number) => ({ uri, display: FontDisplay.FALLBACK });

/**
 * Web: never hold the first paint for the fonts. The four weights are 1.3 MB of TTF; on a
 * phone over busy hospital Wi-Fi that is seconds of blank screen. `fallback` draws text in the
 * system font at once and swaps to Inter only if it arrives within about 3 s, so a late font
 * never moves the page under the nurse's finger (no layout shift); it is cached for next time.
 */
export function useAppFonts(): boolean {
  useFonts({
    Inter_400Regular: fallback(Inter_400Regular),
    Inter_500Medium: fallback(Inter_500Medium),
    Inter_600SemiBold: fallback(Inter_600SemiBold),
    Inter_700Bold: fallback(Inter_700Bold),
  });
  return true;
}

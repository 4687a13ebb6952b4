import Svg, { Circle, Path, Rect } from 'react-native-svg';
import { drawShapes, type IconName } from './icon-shapes';

export type { IconName } from './icon-shapes';

const ELEMENTS = { path: Path, circle: Circle, rect: Rect };

/** Warmfold's own line icons, drawn here so nothing is fetched at run time. Decorative: the word beside carries the meaning. */
export function Icon({ name, size = 20, color }: { name: IconName; size?: number; color: string }) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24" accessibilityElementsHidden importantForAccessibility="no" aria-hidden>
      {drawShapes(name, color, ELEMENTS)}
    </Svg>
  );
}

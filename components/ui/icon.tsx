import Svg, { Circle, Path, Rect } from 'react-native-svg';
import { ICON_SHAPES, strokeProps, type IconName } from './icon-shapes';

export type { IconName } from './icon-shapes';

/** Warmfold's own line icons, drawn here so nothing is fetched at run time. Decorative: the word beside carries the meaning. */
export function Icon({ name, size = 20, color }: { name: IconName; size?: number; color: string }) {
  const p = strokeProps(color);
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24" accessibilityElementsHidden importantForAccessibility="no" aria-hidden>
      {ICON_SHAPES[name].map((s, i) =>
        s.kind === 'path' ? (
          <Path key={i} d={s.d} {...p} />
        ) : s.kind === 'circle' ? (
          <Circle key={i} cx={s.cx} cy={s.cy} r={s.r} {...p} fill={s.solid ? color : 'none'} />
        ) : (
          <Rect key={i} x={s.x} y={s.y} width={s.width} height={s.height} rx={s.rx} {...p} />
        ),
      )}
    </Svg>
  );
}

import { ICON_SHAPES, strokeProps, type IconName } from './icon-shapes';

export type { IconName } from './icon-shapes';

/**
 * The web's Icon: the same shapes as icon.tsx, as plain SVG elements (react-dom draws them), so
 * sign-in and the bedside screens load without react-native-svg. Decorative: aria-hidden, the
 * word beside carries the meaning.
 */
export function Icon({ name, size = 20, color }: { name: IconName; size?: number; color: string }) {
  const p = strokeProps(color);
  return (
    <svg width={size} height={size} viewBox="0 0 24 24" aria-hidden="true" focusable="false" style={{ flexShrink: 0, display: 'block' }}>
      {ICON_SHAPES[name].map((s, i) =>
        s.kind === 'path' ? (
          <path key={i} d={s.d} {...p} />
        ) : s.kind === 'circle' ? (
          <circle key={i} cx={s.cx} cy={s.cy} r={s.r} {...p} fill={s.solid ? color : 'none'} />
        ) : (
          <rect key={i} x={s.x} y={s.y} width={s.width} height={s.height} rx={s.rx} {...p} />
        ),
      )}
    </svg>
  );
}

import { drawShapes, type IconName } from './icon-shapes';

export type { IconName } from './icon-shapes';

const ELEMENTS = { path: 'path', circle: 'circle', rect: 'rect' } as const;

/**
 * The web's Icon: the same shapes as icon.tsx, as plain SVG elements (react-dom draws them), so
 * sign-in and the bedside screens load without react-native-svg. Decorative: aria-hidden, the
 * word beside carries the meaning.
 */
export function Icon({ name, size = 20, color }: { name: IconName; size?: number; color: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 24 24" aria-hidden="true" focusable="false" style={{ flexShrink: 0, display: 'block' }}>
      {drawShapes(name, color, ELEMENTS)}
    </svg>
  );
}

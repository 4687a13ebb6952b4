/**
 * Warmfold's own line icons as data: each is strokes on a 24 x 24 grid. icon.tsx draws them with
 * react-native-svg; icon.web.tsx draws the same shapes as plain SVG elements, so the web's first
 * page does not carry react-native-svg (it arrives later, with the charts).
 */
import { createElement, type ElementType, type ReactNode } from 'react';

export type IconName =
  | 'alert'
  | 'clock'
  | 'check'
  | 'thermometer'
  | 'flame'
  | 'snow'
  | 'hands'
  | 'grid'
  | 'cot'
  | 'list'
  | 'review'
  | 'gear'
  | 'users'
  | 'plus'
  | 'chevron'
  | 'back'
  | 'cloud-off'
  | 'bell'
  | 'hand'
  | 'out'
  | 'print';

export type IconShape =
  | { kind: 'path'; d: string }
  | { kind: 'circle'; cx: number; cy: number; r: number; /** A filled dot rather than a ring. */ solid?: boolean }
  | { kind: 'rect'; x: number; y: number; width: number; height: number; rx?: number };

const path = (d: string): IconShape => ({ kind: 'path', d });
const circle = (cx: number, cy: number, r: number, solid = false): IconShape => ({ kind: 'circle', cx, cy, r, solid });
const rect = (x: number, y: number, width: number, height: number, rx?: number): IconShape => ({ kind: 'rect', x, y, width, height, rx });

export const ICON_SHAPES: Record<IconName, IconShape[]> = {
  alert: [path('M12 3 L22 20 H2 Z'), path('M12 10 V14'), circle(12, 17, 0.8, true)],
  clock: [circle(12, 12, 9), path('M12 7 V12 L15.5 14')],
  check: [path('M4 12.5 L9.5 18 L20 6.5')],
  thermometer: [path('M10 14.5 V5 a2 2 0 0 1 4 0 V14.5 a4 4 0 1 1 -4 0 Z'), path('M12 9 V17')],
  flame: [path('M12 3 C14 7 18 9 18 14 a6 6 0 0 1 -12 0 c0 -3 2 -4.5 3 -6.5 c1 2 2 2.5 3 2.5 c0 -2 -1 -4 0 -7 Z')],
  snow: [path('M12 3 V21 M4.2 7.5 L19.8 16.5 M4.2 16.5 L19.8 7.5 M9.5 4.5 L12 6.5 L14.5 4.5 M9.5 19.5 L12 17.5 L14.5 19.5')],
  hands: [circle(8, 7, 3), circle(16.5, 11, 2), path('M3 20 c0 -5 3 -8 5 -8 s5 2 6 4 c1 -1 3 -1.5 4.5 -1 M14 20 c1 -1.5 3 -2.5 5 -2')],
  grid: [rect(3, 3, 7.5, 7.5, 1.5), rect(13.5, 3, 7.5, 7.5, 1.5), rect(3, 13.5, 7.5, 7.5, 1.5), rect(13.5, 13.5, 7.5, 7.5, 1.5)],
  cot: [path('M3 7 V19 M21 7 V19 M3 15 H21 M3 11 H21 M7.5 11 V15 M12 11 V15 M16.5 11 V15')],
  list: [path('M8 6 H20 M8 12 H20 M8 18 H20 M4 6 H4.01 M4 12 H4.01 M4 18 H4.01')],
  review: [path('M5 3 H15 L19 7 V21 H5 Z'), path('M8.5 13 L11 15.5 L15.5 10.5')],
  gear: [circle(12, 12, 3), path('M12 2.5 V5 M12 19 V21.5 M2.5 12 H5 M19 12 H21.5 M5.3 5.3 L7 7 M17 17 L18.7 18.7 M5.3 18.7 L7 17 M17 7 L18.7 5.3')],
  users: [circle(9, 8, 3.5), path('M2.5 20 c0 -4 3 -6.5 6.5 -6.5 s6.5 2.5 6.5 6.5 M16 4.8 a3.5 3.5 0 0 1 0 6.4 M18 14 c2 .8 3.5 2.8 3.5 6')],
  plus: [path('M12 5 V19 M5 12 H19')],
  chevron: [path('M9 5 L16 12 L9 19')],
  back: [path('M15 5 L8 12 L15 19')],
  'cloud-off': [path('M3 3 L21 21 M8 8 a5 5 0 0 0 -1 9.8 H17 M12 6 a5 5 0 0 1 6.5 4.5 a3.5 3.5 0 0 1 2 5.5')],
  bell: [path('M6 16 V11 a6 6 0 0 1 12 0 V16 L20 18 H4 Z M10 21 H14')],
  hand: [
    path(
      'M7 12 V6.5 a1.5 1.5 0 0 1 3 0 V11 M10 11 V4.5 a1.5 1.5 0 0 1 3 0 V11 M13 11 V5.5 a1.5 1.5 0 0 1 3 0 V12 M16 12 V8.5 a1.5 1.5 0 0 1 3 0 V14 a7 7 0 0 1 -7 7 c-3 0 -4.5 -1.5 -6.5 -4.5 L3.5 13.5 a1.6 1.6 0 0 1 2.6 -1.8 L7 13',
    ),
  ],
  out: [path('M14 4 H19 V20 H14 M10 8 L6 12 L10 16 M6 12 H16')],
  print: [path('M7 8 V3 H17 V8 M7 17 H4 V9 H20 V17 H17'), rect(7, 14, 10, 7)],
};

/** The elements one renderer draws with: react-native-svg's components, or the DOM's tag names. */
export interface ShapeElements {
  path: ElementType;
  circle: ElementType;
  rect: ElementType;
}

/** The icon's shapes as `elements`, in the stroke every shape shares; a solid dot is filled with the same colour. */
export function drawShapes(name: IconName, color: string, elements: ShapeElements): ReactNode[] {
  const p = { stroke: color, strokeWidth: 2, fill: 'none', strokeLinecap: 'round' as const, strokeLinejoin: 'round' as const };
  return ICON_SHAPES[name].map((s, key) =>
    s.kind === 'path'
      ? createElement(elements.path, { key, d: s.d, ...p })
      : s.kind === 'circle'
        ? createElement(elements.circle, { key, cx: s.cx, cy: s.cy, r: s.r, ...p, fill: s.solid ? color : 'none' })
        : createElement(elements.rect, { key, x: s.x, y: s.y, width: s.width, height: s.height, rx: s.rx, ...p }),
  );
}

import Svg, { Circle, Path, Rect } from 'react-native-svg';

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

/** Warmfold's own line icons, drawn here so nothing is fetched at run time. Decorative: the word beside carries the meaning. */
export function Icon({ name, size = 20, color }: { name: IconName; size?: number; color: string }) {
  const p = { stroke: color, strokeWidth: 2, fill: 'none', strokeLinecap: 'round' as const, strokeLinejoin: 'round' as const };
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24" accessibilityElementsHidden importantForAccessibility="no" aria-hidden>
      {name === 'alert' && (
        <>
          <Path d="M12 3 L22 20 H2 Z" {...p} />
          <Path d="M12 10 V14" {...p} />
          <Circle cx="12" cy="17" r="0.8" fill={color} stroke={color} />
        </>
      )}
      {name === 'clock' && (
        <>
          <Circle cx="12" cy="12" r="9" {...p} />
          <Path d="M12 7 V12 L15.5 14" {...p} />
        </>
      )}
      {name === 'check' && <Path d="M4 12.5 L9.5 18 L20 6.5" {...p} />}
      {name === 'thermometer' && (
        <>
          <Path d="M10 14.5 V5 a2 2 0 0 1 4 0 V14.5 a4 4 0 1 1 -4 0 Z" {...p} />
          <Path d="M12 9 V17" {...p} />
        </>
      )}
      {name === 'flame' && <Path d="M12 3 C14 7 18 9 18 14 a6 6 0 0 1 -12 0 c0 -3 2 -4.5 3 -6.5 c1 2 2 2.5 3 2.5 c0 -2 -1 -4 0 -7 Z" {...p} />}
      {name === 'snow' && <Path d="M12 3 V21 M4.2 7.5 L19.8 16.5 M4.2 16.5 L19.8 7.5 M9.5 4.5 L12 6.5 L14.5 4.5 M9.5 19.5 L12 17.5 L14.5 19.5" {...p} />}
      {name === 'hands' && (
        <>
          <Circle cx="8" cy="7" r="3" {...p} />
          <Circle cx="16.5" cy="11" r="2" {...p} />
          <Path d="M3 20 c0 -5 3 -8 5 -8 s5 2 6 4 c1 -1 3 -1.5 4.5 -1 M14 20 c1 -1.5 3 -2.5 5 -2" {...p} />
        </>
      )}
      {name === 'grid' && (
        <>
          <Rect x="3" y="3" width="7.5" height="7.5" rx="1.5" {...p} />
          <Rect x="13.5" y="3" width="7.5" height="7.5" rx="1.5" {...p} />
          <Rect x="3" y="13.5" width="7.5" height="7.5" rx="1.5" {...p} />
          <Rect x="13.5" y="13.5" width="7.5" height="7.5" rx="1.5" {...p} />
        </>
      )}
      {name === 'cot' && <Path d="M3 7 V19 M21 7 V19 M3 15 H21 M3 11 H21 M7.5 11 V15 M12 11 V15 M16.5 11 V15" {...p} />}
      {name === 'list' && <Path d="M8 6 H20 M8 12 H20 M8 18 H20 M4 6 H4.01 M4 12 H4.01 M4 18 H4.01" {...p} />}
      {name === 'review' && (
        <>
          <Path d="M5 3 H15 L19 7 V21 H5 Z" {...p} />
          <Path d="M8.5 13 L11 15.5 L15.5 10.5" {...p} />
        </>
      )}
      {name === 'gear' && (
        <>
          <Circle cx="12" cy="12" r="3" {...p} />
          <Path d="M12 2.5 V5 M12 19 V21.5 M2.5 12 H5 M19 12 H21.5 M5.3 5.3 L7 7 M17 17 L18.7 18.7 M5.3 18.7 L7 17 M17 7 L18.7 5.3" {...p} />
        </>
      )}
      {name === 'users' && (
        <>
          <Circle cx="9" cy="8" r="3.5" {...p} />
          <Path d="M2.5 20 c0 -4 3 -6.5 6.5 -6.5 s6.5 2.5 6.5 6.5 M16 4.8 a3.5 3.5 0 0 1 0 6.4 M18 14 c2 .8 3.5 2.8 3.5 6" {...p} />
        </>
      )}
      {name === 'plus' && <Path d="M12 5 V19 M5 12 H19" {...p} />}
      {name === 'chevron' && <Path d="M9 5 L16 12 L9 19" {...p} />}
      {name === 'back' && <Path d="M15 5 L8 12 L15 19" {...p} />}
      {name === 'cloud-off' && <Path d="M3 3 L21 21 M8 8 a5 5 0 0 0 -1 9.8 H17 M12 6 a5 5 0 0 1 6.5 4.5 a3.5 3.5 0 0 1 2 5.5" {...p} />}
      {name === 'bell' && <Path d="M6 16 V11 a6 6 0 0 1 12 0 V16 L20 18 H4 Z M10 21 H14" {...p} />}
      {name === 'hand' && <Path d="M7 12 V6.5 a1.5 1.5 0 0 1 3 0 V11 M10 11 V4.5 a1.5 1.5 0 0 1 3 0 V11 M13 11 V5.5 a1.5 1.5 0 0 1 3 0 V12 M16 12 V8.5 a1.5 1.5 0 0 1 3 0 V14 a7 7 0 0 1 -7 7 c-3 0 -4.5 -1.5 -6.5 -4.5 L3.5 13.5 a1.6 1.6 0 0 1 2.6 -1.8 L7 13" {...p} />}
      {name === 'out' && <Path d="M14 4 H19 V20 H14 M10 8 L6 12 L10 16 M6 12 H16" {...p} />}
      {name === 'print' && (
        <>
          <Path d="M7 8 V3 H17 V8 M7 17 H4 V9 H20 V17 H17" {...p} />
          <Rect x="7" y="14" width="10" height="7" {...p} />
        </>
      )}
    </Svg>
  );
}

import { Component, lazy, Suspense, useEffect, useRef, useState, type ReactNode, type RefObject } from 'react';
import { View } from 'react-native';
import { afterNextPaint } from '@/components/ui/after-next-paint';
import { Text } from '@/components/ui/text';

type Plots = typeof import('./chart-plots');

let plots: Promise<Plots> | undefined;
/** One request for the chart chunk however many charts ask; a failed request is forgotten so that a later chart tries again. */
function loadPlots(): Promise<Plots> {
  plots ??= import('./chart-plots').catch((err: unknown) => {
    plots = undefined;
    throw err;
  });
  return plots;
}

// Both resolve from the same chunk: see chart-plots.ts for why they must not be separate imports.
export const LazyTrendPlot = lazy(() => loadPlots().then((m) => ({ default: m.TrendPlot })));
export const LazyOnTimePlot = lazy(() => loadPlots().then((m) => ({ default: m.OnTimePlot })));

/**
 * A box of the chart's exact height that fetches and draws the chart only once the box is near
 * the screen. The box is there from the first paint and the chart draws inside it, so nothing
 * below moves when it arrives (no layout shift), and a chart below the fold costs the first load
 * nothing. If the chunk cannot be fetched (a dropped connection), `unavailable` is shown in the
 * box instead of the screen failing: the figures are always written out next to the chart.
 */
export function DeferredChart({ height, unavailable, children }: { height: number; unavailable: string; children: ReactNode }) {
  const box = useRef<View>(null);
  const near = useNearScreen(box);
  return (
    <View ref={box} style={{ height }}>
      {near ? (
        <ChartBoundary unavailable={unavailable}>
          <Suspense fallback={null}>{children}</Suspense>
        </ChartBoundary>
      ) : null}
    </View>
  );
}

/** How far ahead of the visible area a chart starts loading, so a nurse scrolling down rarely sees the empty box. */
const AHEAD_PX = 200;

/**
 * True once the element is within AHEAD_PX of being visible. Screens scroll inside their own
 * container (react-native-web's ScrollView), which clips its content; a margin on the viewport
 * would be clipped away with it, so the nearest scrolling ancestor is the observer's root.
 * Without IntersectionObserver (native, tests) the chart simply renders after the first commit.
 */
function useNearScreen(ref: RefObject<View | null>): boolean {
  const [near, setNear] = useState(false);
  useEffect(() => {
    const node: unknown = ref.current;
    if (typeof IntersectionObserver === 'undefined' || typeof Element === 'undefined' || !(node instanceof Element)) {
      setNear(true);
      return;
    }
    let io: IntersectionObserver | undefined;
    // Set up after the first paint: finding the scrolling ancestor reads computed styles, which
    // before that paint makes the browser work out the whole page's styles an extra time.
    const cancel = afterNextPaint(() => {
      io = new IntersectionObserver(
        (entries) => {
          if (entries.some((e) => e.isIntersecting)) {
            setNear(true);
            io?.disconnect();
          }
        },
        { root: scrollParent(node), rootMargin: `${AHEAD_PX}px 0px` },
      );
      io.observe(node);
    });
    return () => {
      cancel();
      io?.disconnect();
    };
  }, [ref]);
  return near;
}

function scrollParent(node: Element): Element | null {
  for (let el = node.parentElement; el; el = el.parentElement) {
    const { overflowY } = getComputedStyle(el);
    if (overflowY === 'auto' || overflowY === 'scroll') return el;
  }
  return null;
}

class ChartBoundary extends Component<{ unavailable: string; children: ReactNode }, { failed: boolean }> {
  state = { failed: false };

  static getDerivedStateFromError(): { failed: boolean } {
    return { failed: true };
  }

  render() {
    return this.state.failed ? (
      <Text variant="caption" tone="muted">
        {this.props.unavailable}
      </Text>
    ) : (
      this.props.children
    );
  }
}

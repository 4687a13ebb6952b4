import { useEffect, useState } from 'react';

/**
 * Run `fn` once the browser has painted what the current event changed (a pressed button): a
 * screen change then renders in a task of its own instead of holding the tap's feedback back
 * (the interaction's next paint, what INP measures). Navigation in Expo Router goes through
 * useSyncExternalStore, which a React transition cannot defer, so the wait is done by hand.
 */
export function afterNextPaint(fn: () => void): () => void {
  if (typeof requestAnimationFrame !== 'function') {
    fn();
    return () => {};
  }
  let timer: ReturnType<typeof setTimeout> | undefined;
  const frame = requestAnimationFrame(() => {
    timer = setTimeout(fn, 0);
  });
  /** Cancels `fn` if it has not run yet. */
  return () => {
    cancelAnimationFrame(frame);
    if (timer !== undefined) clearTimeout(timer);
  };
}

/** False in a component's first render, true once the browser has painted it: for reads the first screen does not need. */
export function useAfterFirstPaint(): boolean {
  const [painted, setPainted] = useState(false);
  useEffect(() => afterNextPaint(() => setPainted(true)), []);
  return painted;
}

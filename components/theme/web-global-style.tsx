import type { Theme } from './theme';

/** Native has no document; focus and the page colour are the platform's. */
export function WebGlobalStyle(_props: { theme: Theme }): null {
  return null;
}

import type { ReactNode } from 'react';

/** Left off the printed handover (see print-style.web.tsx). */
export function NoPrint({ children }: { children: ReactNode }) {
  return <div data-noprint="">{children}</div>;
}

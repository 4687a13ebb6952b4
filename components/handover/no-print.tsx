import type { ReactNode } from 'react';

/** A device does not print; the children show as they are. */
export function NoPrint({ children }: { children: ReactNode }) {
  return <>{children}</>;
}

import type { ReactNode } from 'react';

/** Off the web nothing is printed: the sections are shown as they are (print-page.web.tsx prints them). */
export function PrintPage({ children }: { header: ReactNode; children: ReactNode; first?: boolean }) {
  return <>{children}</>;
}

export function PrintPageStyle() {
  return null;
}

export function PrintOnly(_props: { children: ReactNode }) {
  return null;
}

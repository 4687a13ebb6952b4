import { formatTemperature } from '@/shared/thermal/units';

/** "16 Nov 08:40" in the browser's zone, 24-hour. */
export function shortDateTime(iso: string): string {
  const d = new Date(iso);
  return d.toLocaleString('en-GB', { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', hour12: false });
}

export function minutesText(m: number | null): string {
  return m === null ? '—' : m < 90 ? `${m} min` : `${Math.floor(m / 60)} h ${m % 60} min`;
}

export function temp(centi: number | null): string {
  return centi === null ? '—' : formatTemperature(centi, 'C');
}

/** YYYY-MM-DD of a local day `offset` days from today. */
export function localDay(offset = 0): string {
  const d = new Date();
  d.setDate(d.getDate() + offset);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

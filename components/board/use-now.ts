import { useEffect, useState } from 'react';

/**
 * The current time, re-read every second, corrected by the server's clock: `serverTime` is the
 * server's instant when the data was made, so countdowns agree with the server, not the device.
 */
export function useNow(serverTime: string | undefined, intervalMs = 1000): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    // The skew is measured once per answer; the first tick follows at once, the rest every interval.
    const skew = serverTime ? Date.parse(serverTime) - Date.now() : 0;
    const tick = () => setNow(Date.now() + skew);
    const first = setTimeout(tick, 0);
    const id = setInterval(tick, intervalMs);
    return () => {
      clearTimeout(first);
      clearInterval(id);
    };
  }, [serverTime, intervalMs]);
  return now;
}

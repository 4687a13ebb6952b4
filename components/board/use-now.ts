import { useEffect, useState } from 'react';

/**
 * The current time, re-read every second, corrected by the server's clock: `serverTime` is the
 * server's instant when the data was made, so countdowns agree with the server, not the device.
 */
export function useNow(serverTime: string | undefined, intervalMs = 1000): number {
  const [skew, setSkew] = useState(0);
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (serverTime) setSkew(Date.parse(serverTime) - Date.now());
  }, [serverTime]);
  useEffect(() => {
    const id = setInterval(() => setNow(Date.now()), intervalMs);
    return () => clearInterval(id);
  }, [intervalMs]);
  return now + skew;
}

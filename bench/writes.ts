/**
 * Durable writes: POST a reading as fast as the server takes them. Every request carries a new
 * uuid, so each one is a real insert, a flag sync and an audit event committed with an fsync
 * (synchronous=FULL), not an idempotent replay. Readings spread over the nurse's infants.
 */
import autocannon from 'autocannon';
import { randomUUID } from 'node:crypto';

export interface WriteFigures {
  commitsPerSec: number;
  p50: number;
  p99: number;
  requests: number;
  non2xx: number;
  errors: number;
}

export async function benchWrites(base: string, infantIds: string[], token: string, opts: { connections: number; seconds: number }): Promise<WriteFigures> {
  let n = 0;
  const result = await autocannon({
    url: base,
    connections: opts.connections,
    duration: opts.seconds,
    timeout: 30,
    requests: [
      {
        method: 'POST',
        headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
        setupRequest: (req) => {
          const infantId = infantIds[n++ % infantIds.length]!;
          const remote = 36.7 + (n % 5) / 10;
          return {
            ...req,
            path: `/api/infants/${infantId}/readings`,
            // What the app sends for a routine check: the form carries the last control mode and set temperature forward.
            body: JSON.stringify({
              id: randomUUID(),
              unit: 'C',
              probe: Math.round((remote - 0.1) * 10) / 10,
              remote,
              remoteSite: 'axilla',
              controlMode: 'skin-servo',
              set: 36.5,
              heartRate: 140 + (n % 20),
            }),
          };
        },
      },
    ],
  });
  return {
    commitsPerSec: result['2xx'] / result.duration,
    p50: result.latency.p50,
    p99: result.latency.p99,
    requests: result.requests.total,
    non2xx: result.non2xx,
    errors: result.errors + result.timeouts,
  };
}

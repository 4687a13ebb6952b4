/** The part of autocannon 9's API the bench uses (the package ships no types). */
declare module 'autocannon' {
  export interface Histogram {
    average: number;
    mean: number;
    stddev: number;
    min: number;
    max: number;
    p50: number;
    p90: number;
    p97_5: number;
    p99: number;
    total: number;
  }
  export interface Request {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    body?: string;
    setupRequest?: (req: Request, context: Record<string, unknown>) => Request;
  }
  export interface Options {
    url: string;
    connections?: number;
    duration?: number;
    amount?: number;
    method?: string;
    headers?: Record<string, string>;
    body?: string;
    requests?: Request[];
    pipelining?: number;
    timeout?: number;
  }
  export interface Result {
    requests: Histogram;
    latency: Histogram;
    throughput: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
    '2xx': number;
    duration: number;
  }
  function autocannon(opts: Options): Promise<Result>;
  export default autocannon;
}

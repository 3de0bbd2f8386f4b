/** The part of autocannon 9's API the load script uses (the package ships no types). */
declare module 'autocannon' {
  export interface Request {
    method?: string;
    path: string;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    maxOverallRequests?: number;
    /** Requests per second over all connections (a paced, open-ended load). */
    overallRate?: number;
    timeout?: number;
    headers?: Record<string, string>;
    requests?: Request[];
  }
  interface Histogram {
    average: number;
    mean: number;
    p50: number;
    p90: number;
    p99: number;
    max: number;
    total: number;
  }
  export interface Result {
    requests: Histogram & { sent: number };
    latency: Histogram;
    throughput: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
    duration: number;
    statusCodeStats: Record<string, { count: number }>;
  }
  interface Instance extends PromiseLike<Result> {
    stop(): void;
  }
  function autocannon(opts: Options): Instance;
  export default autocannon;
}

// The parts of autocannon (npm, no types of its own) the benches use.
declare module 'autocannon' {
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    headers?: Record<string, string>;
  }
  interface Histogram {
    average: number;
    p50: number;
    p90: number;
    p97_5: number;
    p99: number;
    max: number;
  }
  interface Result {
    requests: Histogram & { total: number };
    latency: Histogram;
    throughput: Histogram;
    non2xx: number;
    errors: number;
    timeouts: number;
    statusCodeStats?: Record<string, { count: number }>;
  }
  function autocannon(opts: Options): Promise<Result>;
  export default autocannon;
}

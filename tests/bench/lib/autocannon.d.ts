// The part of autocannon's API the bench uses (the package ships no types).
declare module 'autocannon' {
  interface Histogram {
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
  interface Result {
    requests: Histogram;
    latency: Histogram;
    throughput: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
    duration: number;
    '2xx': number;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    amount?: number;
    pipelining?: number;
    headers?: Record<string, string>;
    method?: string;
    timeout?: number;
  }
  function autocannon(opts: Options): Promise<Result>;
  export default autocannon;
  export type { Result, Options };
}

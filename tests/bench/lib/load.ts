import autocannon from 'autocannon';

export interface LoadResult {
  requestsPerSecond: number;
  p50Ms: number;
  p99Ms: number;
  requests: number;
  errors: number;
  non2xx: number;
}

/** Drives one URL with autocannon for a fixed time at a fixed concurrency (loopback only). */
export async function load(url: string, opts: { connections: number; durationSeconds: number; headers?: Record<string, string> }): Promise<LoadResult> {
  const r = await autocannon({ url, connections: opts.connections, duration: opts.durationSeconds, headers: opts.headers, timeout: 10 });
  return {
    requestsPerSecond: r.requests.average,
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    requests: r.requests.total,
    errors: r.errors + r.timeouts,
    non2xx: r.non2xx,
  };
}

/** A short unmeasured run so both servers are measured warm (JIT, SQLite page cache). */
export async function warmUp(url: string, headers?: Record<string, string>): Promise<void> {
  await autocannon({ url, connections: 4, duration: 2, headers });
}

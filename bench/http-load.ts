/**
 * One load run with autocannon against a server on loopback: a fixed number of connections for
 * a fixed time, each connection sending its next request as soon as the last one is answered.
 * Latency percentiles are taken from every response's own time (autocannon's summary has no
 * p95), and every response that is not 2xx is counted, as is every socket error and timeout.
 */
import autocannon, { type AutocannonRequest } from "autocannon";

export interface LoadTarget {
  /** What the row is called in the report. */
  name: string;
  baseUrl: string;
  /** The request path; called once per request when it is a function (e.g. a random engine). */
  path: string | (() => string);
  headers: Record<string, string>;
}

export interface LoadResult {
  name: string;
  connections: number;
  seconds: number;
  requests: number;
  requestsPerSecond: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  errors: number;
  timeouts: number;
  non2xx: number;
  statusCodes: Record<string, number>;
}

/** Seconds after which one request counts as timed out. */
const REQUEST_TIMEOUT_S = 10;

export function pickPercentile(sortedMs: number[], percentile: number): number {
  if (sortedMs.length === 0) return 0;
  const rank = Math.ceil((percentile / 100) * sortedMs.length) - 1;
  return sortedMs[Math.min(sortedMs.length - 1, Math.max(0, rank))];
}

function toRequest(target: LoadTarget): AutocannonRequest {
  const { path } = target;
  if (typeof path === "string") return { method: "GET", path };
  return {
    method: "GET",
    setupRequest: (request) => {
      request.path = path();
      return request;
    },
  };
}

interface RawRun {
  times: number[];
  requests: number;
  seconds: number;
  errors: number;
  timeouts: number;
  non2xx: number;
  statusCodes: Record<string, number>;
}

/** One autocannon run; never longer than seconds + the request timeout. */
function runOnce(target: LoadTarget, connections: number, seconds: number): Promise<RawRun> {
  const times: number[] = [];
  return new Promise((resolve, reject) => {
    const instance = autocannon(
      {
        url: target.baseUrl,
        connections,
        duration: seconds,
        timeout: REQUEST_TIMEOUT_S,
        headers: target.headers,
        requests: [toRequest(target)],
      },
      (err, result) => {
        if (err) return reject(err);
        const statusCodes = Object.fromEntries(Object.entries(result.statusCodeStats ?? {}).map(([code, v]) => [code, v.count]));
        resolve({
          times,
          requests: result.requests.total,
          seconds: result.duration,
          errors: result.errors,
          timeouts: result.timeouts,
          non2xx: result.non2xx,
          statusCodes,
        });
      },
    );
    instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTimeMs: number) => {
      times.push(responseTimeMs);
    });
  });
}

function summarize(name: string, connections: number, runs: RawRun[]): LoadResult {
  const times = runs.flatMap((r) => r.times).sort((a, b) => a - b);
  const requests = runs.reduce((n, r) => n + r.requests, 0);
  const seconds = runs.reduce((n, r) => n + r.seconds, 0);
  const statusCodes: Record<string, number> = {};
  for (const r of runs) for (const [code, n] of Object.entries(r.statusCodes)) statusCodes[code] = (statusCodes[code] ?? 0) + n;
  return {
    name,
    connections,
    seconds,
    requests,
    requestsPerSecond: seconds > 0 ? requests / seconds : 0,
    p50Ms: pickPercentile(times, 50),
    p95Ms: pickPercentile(times, 95),
    p99Ms: pickPercentile(times, 99),
    maxMs: times.length ? times[times.length - 1] : 0,
    errors: runs.reduce((n, r) => n + r.errors, 0),
    timeouts: runs.reduce((n, r) => n + r.timeouts, 0),
    non2xx: runs.reduce((n, r) => n + r.non2xx, 0),
    statusCodes,
  };
}

/** Runs one target at `connections` for `seconds`. */
export async function measureLoad(target: LoadTarget, connections: number, seconds: number): Promise<LoadResult> {
  return summarize(target.name, connections, [await runOnce(target, connections, seconds)]);
}

/**
 * Runs several targets in turn, in `slices` rounds of seconds / slices each, and adds each
 * target's slices up: when the load on the machine changes during the measurement, every target
 * gets its share of the change, so their ratio stays fair.
 */
export async function measureLoadAlternating(targets: LoadTarget[], connections: number, seconds: number, slices: number): Promise<LoadResult[]> {
  const runs = targets.map((): RawRun[] => []);
  for (let s = 0; s < slices; s += 1) {
    for (let t = 0; t < targets.length; t += 1) runs[t].push(await runOnce(targets[t], connections, seconds / slices));
  }
  return targets.map((t, i) => summarize(t.name, connections, runs[i]));
}

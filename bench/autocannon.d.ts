// The part of autocannon 8's API the benches use (the package ships no type declarations).
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  interface AutocannonRequest {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    setupRequest?: (request: { method: string; path: string; headers: Record<string, string> }, context: Record<string, unknown>) => unknown;
  }

  interface AutocannonOptions {
    url: string;
    connections?: number;
    duration?: number;
    timeout?: number;
    headers?: Record<string, string>;
    requests?: AutocannonRequest[];
    excludeErrorStats?: boolean;
  }

  interface Histogram {
    average: number;
    total: number;
    p50: number;
    p99: number;
  }

  interface AutocannonResult {
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    "2xx": number;
    requests: Histogram & { sent: number };
    latency: Histogram;
    statusCodeStats: Record<string, { count: number }>;
  }

  interface AutocannonInstance extends EventEmitter {
    stop(): void;
  }

  function autocannon(opts: AutocannonOptions, cb: (err: Error | null, result: AutocannonResult) => void): AutocannonInstance;
  export default autocannon;
  export type { AutocannonOptions, AutocannonRequest, AutocannonResult, AutocannonInstance };
}

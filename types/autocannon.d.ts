// The part of autocannon 9's programmatic API the web benchmark uses (the package ships no types).
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  interface RequestParams {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    pipelining?: number;
    timeout?: number;
    headers?: Record<string, string>;
    requests?: {
      method?: string;
      setupRequest?: (req: RequestParams, context: Record<string, unknown>) => RequestParams;
      /** Called with each answer's headers (lower-cased names) just before the client's "response" event for it. */
      onResponse?: (status: number, body: string, context: Record<string, unknown>, headers: Record<string, string>) => void;
    }[];
  }
  interface Histogram {
    average: number;
    mean: number;
    p50: number;
    p99: number;
    max: number;
    total: number;
  }
  interface Result {
    duration: number;
    requests: Histogram;
    latency: Histogram;
    non2xx: number;
    errors: number;
    timeouts: number;
    "2xx": number;
  }
  interface Instance extends EventEmitter {
    stop(): void;
    on(event: "response", listener: (client: unknown, statusCode: number, resBytes: number, responseTime: number) => void): this;
  }
  function autocannon(options: Options, callback: (err: Error | null, result: Result) => void): Instance;
  export default autocannon;
}

// autocannon ships no types; this is the part of its API the benchmarks use.
declare module "autocannon" {
  interface Options {
    url: string;
    method?: string;
    body?: string;
    headers?: Record<string, string>;
    connections?: number;
    duration?: number;
  }
  interface Histogram {
    average: number;
    p50: number;
    p99: number;
  }
  interface Result {
    requests: Histogram;
    latency: Histogram;
    non2xx: number;
    errors: number;
  }
  export default function autocannon(options: Options): Promise<Result>;
}

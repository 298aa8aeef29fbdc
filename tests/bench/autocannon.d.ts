// The small part of autocannon's API the benchmark uses (the package ships no types).
declare module "autocannon" {
  type Options = { url: string; connections?: number; duration?: number; headers?: Record<string, string> };
  type Histogram = { average: number; p50: number; p99: number; total: number };
  type Result = { requests: Histogram; latency: Histogram; non2xx: number; errors: number };
  function autocannon(opts: Options): Promise<Result>;
  export default autocannon;
}

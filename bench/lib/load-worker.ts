// One load run in a process of its own, so that the load generator never shares an event loop with the
// stand-ins it indirectly measures. Reads its plan as JSON from argv[2]; prints its result as JSON.
import autocannon from "autocannon";

export type LoadPlan = { url: string; connections: number; seconds: number; warmupSeconds: number; maxRequests: number };

export type LoadOutcome = {
  url: string;
  connections: number;
  seconds: number;
  requests: number;
  requestsPerSecond: number;
  latencyMs: { p50: number; p95: number; p99: number; mean: number; max: number };
  non2xx: number;
  errors: number;
  timeouts: number;
  statusCodes: Record<string, number>;
};

function percentile(sorted: number[], p: number) {
  if (!sorted.length) return Number.NaN;
  // Nearest rank: the smallest value with at least p % of the samples at or below it.
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

const plan = JSON.parse(process.argv[2] ?? "{}") as LoadPlan;
const latencies: number[] = [];
const statusCodes: Record<string, number> = {};
const instance = autocannon({
  url: plan.url,
  connections: plan.connections,
  duration: plan.seconds,
  maxOverallRequests: plan.maxRequests,
  timeout: 10,
  warmup: plan.warmupSeconds > 0 ? { connections: plan.connections, duration: plan.warmupSeconds } : undefined,
});
instance.on("response", (_client: unknown, statusCode: number, _bytes: number, responseTime: number) => {
  latencies.push(responseTime);
  statusCodes[statusCode] = (statusCodes[statusCode] ?? 0) + 1;
});
const result = await instance;
latencies.sort((a, b) => a - b);
const outcome: LoadOutcome = {
  url: plan.url,
  connections: plan.connections,
  seconds: result.duration,
  requests: latencies.length,
  requestsPerSecond: latencies.length / result.duration,
  latencyMs: {
    p50: percentile(latencies, 50),
    p95: percentile(latencies, 95),
    p99: percentile(latencies, 99),
    mean: latencies.reduce((sum, value) => sum + value, 0) / Math.max(1, latencies.length),
    max: latencies.at(-1) ?? Number.NaN,
  },
  non2xx: result.non2xx,
  errors: result.errors,
  timeouts: result.timeouts,
  statusCodes,
};
process.stdout.write(`${JSON.stringify(outcome)}\n`);

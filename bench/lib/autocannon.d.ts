// The part of autocannon's programmatic API the bench uses (the package ships no types).
declare module "autocannon" {
  type Options = {
    url: string;
    connections?: number;
    duration?: number;
    maxOverallRequests?: number;
    timeout?: number;
    warmup?: { connections?: number; duration?: number };
  };
  type Result = { duration: number; non2xx: number; errors: number; timeouts: number; requests: { total: number; average: number } };
  type Instance = PromiseLike<Result> & {
    on(event: "response", listener: (client: unknown, statusCode: number, bytes: number, responseTimeMs: number) => void): Instance;
  };
  export default function autocannon(options: Options): Instance;
}

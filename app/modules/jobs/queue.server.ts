// The job queue: pg-boss on our PostgreSQL, in a schema of its own. A request enqueues and returns; the
// workers (running inside the app server process) do the slow or unreliable part with retries.
import { sql, type SQL } from "drizzle-orm";
import PgBoss from "pg-boss";
import { env } from "~/env.server";

export type JobOptions = PgBoss.SendOptions;
/** Handles one job's data; throwing fails the attempt, and pg-boss retries it later. */
export type JobHandler<Data> = (data: Data, job: PgBoss.Job<Data>) => Promise<void>;

type Worker = { name: string; handler: JobHandler<any>; attached: boolean; cron?: string };

// Defaults for every queue unless it says otherwise: a service that is down for hours still gets the work.
const defaultRetries: PgBoss.RetryOptions = { retryLimit: 12, retryDelay: 2, retryBackoff: true };

let starting: Promise<PgBoss> | undefined;
const createdQueues = new Map<string, Promise<void>>();
const workers = new Map<string, Worker>();
const queueSettings = new Map<string, Omit<PgBoss.Queue, "name">>();

/** The process's one pg-boss instance, started on first use; a failed start is tried again next time. */
export function getQueue(): Promise<PgBoss> {
  starting ??= (async () => {
    const boss = new PgBoss({
      connectionString: env().DATABASE_URL,
      schema: env().JOB_QUEUE_SCHEMA,
      max: 4,
      // Maintenance and cron belong to the app servers that run workers; a test process or a web-only
      // server (JOB_WORKERS=false) only sends, with no timers polling the database.
      supervise: env().NODE_ENV !== "test" && env().JOB_WORKERS,
      schedule: env().NODE_ENV !== "test" && env().JOB_WORKERS,
      ...defaultRetries,
    });
    // pg-boss reports lost connections here; they are retried by its own loop and must not crash the server.
    boss.on("error", (error) => console.warn(`[jobs] ${error instanceof Error ? error.message : String(error)}`));
    await boss.start();
    return boss;
  })().catch((error) => {
    starting = undefined;
    createdQueues.clear();
    throw error;
  });
  return starting;
}

/** Settings of a queue (retries, expiry) before its first job; call next to `registerWorker`. */
export function configureQueue(name: string, settings: Omit<PgBoss.Queue, "name">) {
  queueSettings.set(name, settings);
}

// Creating a queue adds a partition to pg-boss's job table; two creations at once can deadlock in
// PostgreSQL, so this process creates its queues one after another and retries one that lost a deadlock
// to another process.
let creationChain: Promise<unknown> = Promise.resolve();

async function createQueueOnce(boss: PgBoss, name: string) {
  for (let attempt = 1; ; attempt++) {
    try {
      await boss.createQueue(name, { ...defaultRetries, ...queueSettings.get(name), name });
      return;
    } catch (error) {
      const deadlock = (error as { code?: string })?.code === "40P01" || /deadlock/i.test(String(error));
      if (!deadlock || attempt >= 5) throw error;
      await new Promise((resolve) => setTimeout(resolve, 50 * attempt + Math.random() * 100));
    }
  }
}

async function ensureQueue(boss: PgBoss, name: string) {
  // pg-boss refuses a queue whose dead-letter queue does not exist yet.
  const deadLetter = queueSettings.get(name)?.deadLetter;
  if (deadLetter) await ensureQueue(boss, deadLetter);
  let created = createdQueues.get(name);
  if (!created) {
    created = creationChain.then(() => createQueueOnce(boss, name));
    creationChain = created.catch(() => {});
    createdQueues.set(name, created);
    created.catch(() => createdQueues.delete(name));
  }
  await created;
}

/** What runs SQL for a Drizzle database or transaction: enough to let pg-boss write through it. */
export type SqlRunner = { execute(query: SQL): Promise<{ rows: unknown[] }> };

/**
 * A Drizzle transaction as pg-boss's `db`: the job row is written on the transaction's connection, so it is
 * stored if and only if the transaction commits. pg-boss sends numbered placeholders ($1, $2, …); each
 * becomes a bound parameter of Drizzle's, never text in the statement.
 */
function jobStoreWithin(runner: SqlRunner): PgBoss.Db {
  return {
    async executeSql(text, values) {
      const chunks: SQL[] = text.split(/\$(\d+)/).map((part, index) => (index % 2 === 0 ? sql.raw(part) : sql`${sql.param(values[Number(part) - 1])}`));
      const result = await runner.execute(sql.join(chunks));
      return { rows: result.rows };
    },
  };
}

/**
 * Puts a job on the named queue; resolves once it is stored in PostgreSQL. With `within`, the job is part
 * of that transaction: it is stored, and later run, only if the transaction commits.
 */
export async function enqueue<Data extends object>(name: string, data: Data, options: JobOptions & { within?: SqlRunner } = {}): Promise<string | null> {
  const { within, ...sendOptions } = options;
  const boss = await getQueue();
  await ensureQueue(boss, name);
  return boss.send(name, data, within ? { ...sendOptions, db: jobStoreWithin(within) } : sendOptions);
}

/**
 * Declares the handler of a queue. Workers start with `startWorkers()` (the app server calls it at boot);
 * a worker declared after that starts at once.
 */
export function registerWorker<Data extends object>(
  name: string,
  handler: JobHandler<Data>,
  queue?: Omit<PgBoss.Queue, "name">,
  options: { /** Also run the job on this cron schedule (UTC), e.g. "23 * * * *" hourly. */ cron?: string } = {},
) {
  if (queue) configureQueue(name, queue);
  const existing = workers.get(name);
  if (existing) {
    existing.handler = handler;
    return;
  }
  const worker: Worker = { name, handler, attached: false, cron: options.cron };
  workers.set(name, worker);
  if (started) void attach(worker).catch(reportStartFailure);
}

let started = false;

// pg-boss 10 runs one job at a time per `work` call and waits for the polling interval between fetches, so a
// queue gets a few pollers: a burst of mail (a demo start, a busy hour) then goes out several a second.
const pollersPerQueue = 3;

async function attach(worker: Worker) {
  if (worker.attached) return;
  const boss = await getQueue();
  await ensureQueue(boss, worker.name);
  // pg-boss keeps one schedule per queue and fires it from the servers that run its cron (see getQueue).
  if (worker.cron) await boss.schedule(worker.name, worker.cron, {}, { tz: "UTC" });
  worker.attached = true;
  for (let poller = 0; poller < pollersPerQueue; poller++) {
    await boss.work<any>(worker.name, { pollingIntervalSeconds: 0.5, batchSize: 1 }, async (jobs) => {
      for (const job of jobs) await workers.get(worker.name)!.handler(job.data, job);
    });
  }
}

function reportStartFailure(error: unknown) {
  console.warn(`[jobs] workers could not start yet: ${error instanceof Error ? error.message : String(error)}`);
}

let retryTimer: NodeJS.Timeout | undefined;
let retryDelayMs = 2_000;

/**
 * Starts every declared worker in this process. Safe to call more than once; when the database is not
 * reachable (or two processes create pg-boss's tables at once and one loses a deadlock) it tries again,
 * soon at first and then every 15 s at most, instead of failing the server.
 */
export async function startWorkers(): Promise<void> {
  started = true;
  try {
    for (const worker of workers.values()) await attach(worker);
    retryDelayMs = 2_000;
  } catch (error) {
    reportStartFailure(error);
    clearTimeout(retryTimer);
    retryTimer = setTimeout(() => void startWorkers(), retryDelayMs);
    retryDelayMs = Math.min(retryDelayMs * 2, 15_000);
    retryTimer.unref();
  }
}

/** Stops the queue of this process (tests, shutdown), letting running jobs finish for up to `timeoutMs`. */
export async function stopQueue({ timeoutMs = 10_000 }: { timeoutMs?: number } = {}): Promise<void> {
  clearTimeout(retryTimer);
  started = false;
  const current = starting;
  starting = undefined;
  createdQueues.clear();
  for (const worker of workers.values()) worker.attached = false;
  if (current) {
    const boss = await current.catch(() => undefined);
    await boss?.stop({ graceful: true, wait: true, timeout: timeoutMs });
  }
}

// PostgreSQL lifecycle for development and tests: Debian's server binaries, a cluster of our own under a
// git-ignored folder, listening on loopback only on a port of its own.
import { execFileSync, spawnSync } from "node:child_process";
import { chmodSync, existsSync, mkdirSync, readdirSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import pg from "pg";
import { APP_ROLE, ensureLocalRoles, OWNER_ROLE } from "./database-roles.ts";
import { log } from "./output.ts";

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
// PostgreSQL refuses to run as root; as root we run it as Debian's `postgres` system user.
const serverUser = "postgres";

export function findPostgresBin(): string | undefined {
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return undefined;
  const versions = readdirSync(root)
    .filter((name) => existsSync(path.join(root, name, "bin", "postgres")))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(root, versions[0], "bin") : undefined;
}

/** Finds the server binaries, installing Debian's package when they are missing and we are root. */
export function ensurePostgresInstalled(): string {
  const found = findPostgresBin();
  if (found) return found;
  if (!isRoot) {
    throw new Error(
      "PostgreSQL server binaries were not found under /usr/lib/postgresql/*/bin.\n" +
        "Install Debian's server package and run again:  sudo apt-get install -y postgresql",
    );
  }
  log("postgres", "server binaries missing: installing Debian's postgresql package (apt-get)");
  run("apt-get", ["update"]);
  run("apt-get", ["install", "-y", "--no-install-recommends", "postgresql"], { DEBIAN_FRONTEND: "noninteractive" });
  const installed = findPostgresBin();
  if (!installed) throw new Error("apt-get installed postgresql, but no server binaries appeared under /usr/lib/postgresql");
  return installed;
}

function run(command: string, args: string[], extraEnv: Record<string, string> = {}) {
  const result = spawnSync(command, args, { stdio: "inherit", env: { ...process.env, ...extraEnv } });
  if (result.status !== 0) throw new Error(`${command} ${args.join(" ")} failed with exit code ${result.status}`);
}

function asServerUser(bin: string, file: string, args: string[]) {
  const executable = path.join(bin, file);
  const [command, fullArgs] = isRoot ? ["runuser", ["-u", serverUser, "--", executable, ...args]] : [executable, args];
  return execFileSync(command, fullArgs, { stdio: ["ignore", "pipe", "pipe"], encoding: "utf8" });
}

export type Cluster = {
  dataDir: string;
  port: number;
  database: string;
  /** The app's connection: a role that owns no table and is not a superuser. */
  url: string;
  /** The owner role's connection: migrations, the signing key's registration, bulk seeding. */
  ownerUrl: string;
  stop: () => void;
};

/**
 * Creates the cluster under `dataDir` when it does not exist yet, starts it on 127.0.0.1:`port`, creates
 * `database` and waits until it accepts connections.
 */
export async function startCluster(options: { dataDir: string; port: number; database: string }): Promise<Cluster> {
  const bin = ensurePostgresInstalled();
  const { dataDir, port, database } = options;
  const pgData = path.join(dataDir, "pgdata");
  const socketDir = path.join(dataDir, "socket");
  mkdirSync(socketDir, { recursive: true });
  if (isRoot) {
    // The server user must own its data and be able to pass through every parent folder: add the
    // search (x) bit for others where it is missing, changing nothing else.
    execFileSync("chown", ["-R", `${serverUser}:${serverUser}`, dataDir]);
    for (let dir = path.dirname(path.resolve(dataDir)); dir !== "/"; dir = path.dirname(dir)) {
      const mode = statSync(dir).mode & 0o7777;
      if ((mode & 0o001) === 0) chmodSync(dir, mode | 0o001);
    }
  }
  if (!existsSync(path.join(pgData, "PG_VERSION"))) {
    log("postgres", `creating a cluster in ${pgData}`);
    asServerUser(bin, "initdb", ["-D", pgData, "-A", "trust", "-U", "app", "-E", "UTF8", "--locale=C.UTF-8"]);
  }
  const logFile = path.join(dataDir, "postgres.log");
  if (isRoot && !existsSync(logFile)) {
    writeFileSync(logFile, "");
    execFileSync("chown", [`${serverUser}:${serverUser}`, logFile]);
  }
  try {
    asServerUser(bin, "pg_ctl", ["-D", pgData, "status"]);
    log("postgres", "cluster already running; reusing it");
  } catch {
    asServerUser(bin, "pg_ctl", [
      "-D",
      pgData,
      "-l",
      logFile,
      "-w",
      "-t",
      "60",
      "-o",
      `-p ${port} -k ${socketDir} -c listen_addresses=127.0.0.1 -c fsync=off -c max_connections=200`,
      "start",
    ]);
  }
  // `app` is the cluster's bootstrap superuser (its name kept for data folders made before the two roles).
  const superuserUrl = `postgres://app@127.0.0.1:${port}/${database}`;
  await waitForConnection(`postgres://app@127.0.0.1:${port}/postgres`);
  const admin = new pg.Client({ connectionString: `postgres://app@127.0.0.1:${port}/postgres` });
  await admin.connect();
  const exists = await admin.query("select 1 from pg_database where datname = $1", [database]);
  if (exists.rowCount === 0) await admin.query(`create database "${database}"`);
  await admin.end();
  await waitForConnection(superuserUrl);
  await ensureLocalRoles(superuserUrl, database);
  return {
    dataDir,
    port,
    database,
    url: `postgres://${APP_ROLE}@127.0.0.1:${port}/${database}`,
    ownerUrl: `postgres://${OWNER_ROLE}@127.0.0.1:${port}/${database}`,
    stop: () => {
      try {
        asServerUser(bin, "pg_ctl", ["-D", pgData, "-m", "fast", "-w", "stop"]);
      } catch {
        // already stopped
      }
    },
  };
}

async function waitForConnection(url: string, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  let lastError: unknown;
  while (Date.now() < deadline) {
    const client = new pg.Client({ connectionString: url, connectionTimeoutMillis: 1_000 });
    try {
      await client.connect();
      await client.query("select 1");
      await client.end();
      return;
    } catch (error) {
      lastError = error;
      await client.end().catch(() => {});
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
  }
  throw new Error(`PostgreSQL did not accept connections at ${url}: ${String(lastError)}`);
}

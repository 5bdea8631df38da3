import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";
import { waitForHttp } from "../../../scripts/lib/processes.ts";

const appOrigin = process.env.TEST_APP_ORIGIN!;
const root = path.resolve(import.meta.dirname, "../../..");

describe("GET /api/health", () => {
  it("answers 200 with the database ok", async () => {
    const response = await fetch(`${appOrigin}/api/health`);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ status: "ok", database: "ok" });
  });

  let server: ChildProcess | undefined;
  afterAll(() => {
    server?.kill("SIGTERM");
  });

  it("answers 503 with a reason when the database is not reachable", async () => {
    // A second app server whose database is stopped: nothing listens on its port.
    const [appPort, deadDatabasePort] = [await freePort(), await freePort()];
    server = spawn(process.execPath, [path.join(root, "server/index.mjs"), process.env.TEST_SERVER_BUILD!], {
      cwd: root,
      env: {
        ...process.env,
        NODE_ENV: "production",
        PORT: String(appPort),
        DATABASE_URL: `postgres://app@127.0.0.1:${deadDatabasePort}/tenthmark_test`,
      },
      stdio: "ignore",
    });
    await waitForHttp(`http://127.0.0.1:${appPort}/api/health`, { anyStatus: true });
    const response = await fetch(`http://127.0.0.1:${appPort}/api/health`);
    expect(response.status).toBe(503);
    const body = await response.json();
    expect(body.database).toBe("unreachable");
    expect(body.reason).toMatch(/database unreachable/);
  });
});

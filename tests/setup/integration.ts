import { afterEach, beforeEach, vi } from "vitest";

if (!process.env.DATABASE_URL) {
  throw new Error("Integration tests need the database and stand-ins that `npm test` starts: run them with `npm test`.");
}

// An unexpected console.error is a bug in the code under test: fail the test that caused it.
let consoleErrors: unknown[][] = [];
beforeEach(() => {
  consoleErrors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    consoleErrors.push(args);
  });
});
afterEach(() => {
  vi.mocked(console.error).mockRestore();
  if (consoleErrors.length) {
    throw new Error(`console.error was called:\n${consoleErrors.map((args) => args.map(String).join(" ")).join("\n")}`);
  }
});

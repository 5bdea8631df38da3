const colours: Record<string, string> = { postgres: "34", app: "32", test: "35", build: "33" };

/** One line of a long-running script's output, prefixed with the part it comes from. */
export function log(source: string, message: string) {
  const colour = colours[source] ?? "36";
  const prefix = process.stdout.isTTY ? `\x1b[${colour}m${source.padEnd(9)}\x1b[0m` : source.padEnd(9);
  for (const line of message.split("\n")) console.log(`${prefix}│ ${line}`);
}

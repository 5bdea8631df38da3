// The local stand-ins for hosted services (files, payments, e-mail, search). Each is started here for both
// `npm start` and `npm test`, on loopback only, and hands back the environment that points the app at it.
import { startFilesStandIn } from "../../stand-ins/files/index.ts";
import { startMailStandIn } from "../../stand-ins/mail/index.ts";
import { startPaymentsStandIn } from "../../stand-ins/payments/index.ts";
import { startSearchStandIn } from "../../search/stand-in/index.ts";
import type { LocalSecrets } from "./local-secrets.ts";
import { freePort } from "./ports.ts";

export type StandIn = { name: string; env: Record<string, string>; stop: () => Promise<void> };

export type StandInOptions = {
  dataDir: string;
  /** Fixed ports for `npm start`; the tests take free ones. */
  ports?: Partial<Record<string, number>>;
  appOrigin: string;
  /** The run's generated secrets (scripts/lib/local-secrets.ts): the stand-ins check and sign with these. */
  secrets: LocalSecrets;
  /**
   * Whether the search stand-in writes its snapshot after each index update (default yes). The bench turns
   * it off: a snapshot is the whole index as one JSON text, which outgrows what V8 can hold in one string
   * at about 400 000 listings, and rewriting it per batch makes indexing quadratic.
   */
  searchSnapshots?: boolean;
};

type Starter = (options: StandInOptions & { port: number }) => Promise<StandIn>;

// Each stand-in adds itself to this list with its default port.
const starters: Array<{ name: string; defaultPort: number; start: Starter }> = [
  { name: "files", defaultPort: 4568, start: startFilesStandIn },
  { name: "mail", defaultPort: 4580, start: (options) => startMailStandIn({ ...options, token: options.secrets.POSTMARK_SERVER_TOKEN }) },
  {
    name: "payments",
    defaultPort: 12111,
    start: (options) =>
      startPaymentsStandIn({ ...options, secretKey: options.secrets.STRIPE_SECRET_KEY, webhookSecret: options.secrets.STRIPE_WEBHOOK_SECRET }),
  },
  { name: "search", defaultPort: 7701, start: (options) => startSearchStandIn({ ...options, masterKey: options.secrets.MEILISEARCH_API_KEY, snapshots: options.searchSnapshots }) },
];

export async function startStandIns(options: StandInOptions): Promise<StandIn[]> {
  const started: StandIn[] = [];
  for (const { name, defaultPort, start } of starters) {
    const port = options.ports ? (options.ports[name] ?? defaultPort) : await freePort();
    started.push(await start({ ...options, port }));
  }
  return started;
}

export function standInEnvironment(standIns: StandIn[]): Record<string, string> {
  return Object.assign({}, ...standIns.map((standIn) => standIn.env));
}

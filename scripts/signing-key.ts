// `npm run signing-key -- <command>`: the Ed25519 key that signs report credentials.
//   new        print a new private key (for REPORT_SIGNING_KEY in production)
//   register   record REPORT_SIGNING_KEY as the key signing from now on; the key used until now keeps its
//              public key in /.well-known/did.json with the period it signed in (needs DATABASE_OWNER_URL)
//   rotate     local data folder: replace its key; the next `npm start` registers the new one
//   show       print the public key of REPORT_SIGNING_KEY (or of the data folder's key)
import path from "node:path";
import { newSigningKeyMultibase, signingKeyFromMultibase } from "../app/modules/reports/signing.server.ts";
import { renewSecretOfDataFolder, secretsForDataFolder, SECRETS_FILE } from "./lib/local-secrets.ts";
import { registerKey } from "./lib/signing-key.ts";

const root = path.resolve(import.meta.dirname, "..");
const dataDir = path.resolve(root, process.env.TENTHMARK_DATA_DIR ?? ".data");

async function main(command: string | undefined) {
  switch (command) {
    case "new": {
      const key = newSigningKeyMultibase();
      console.log(`REPORT_SIGNING_KEY=${key}`);
      console.log(`public key: ${signingKeyFromMultibase(key).publicKeyMultibase}`);
      console.log("Keep the private key secret. Register it with `npm run signing-key -- register` before servers sign with it.");
      return;
    }
    case "register": {
      const key = process.env.REPORT_SIGNING_KEY;
      const url = process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL;
      if (!key || !url) throw new Error("Set REPORT_SIGNING_KEY and DATABASE_OWNER_URL (the role that owns the tables).");
      const registered = await registerKey(url, key);
      console.log(registered.added ? `registered ${registered.id} (${registered.publicKeyMultibase}); the previous key is retired from now` : `${registered.id} is already the current key`);
      return;
    }
    case "rotate": {
      const key = renewSecretOfDataFolder(dataDir, "REPORT_SIGNING_KEY");
      console.log(`new key written to ${path.join(dataDir, SECRETS_FILE)} (public key ${signingKeyFromMultibase(key).publicKeyMultibase}).`);
      console.log("The next `npm start` registers it; reports signed with the old key keep verifying.");
      return;
    }
    case "show": {
      const key = process.env.REPORT_SIGNING_KEY || secretsForDataFolder(dataDir).REPORT_SIGNING_KEY;
      console.log(signingKeyFromMultibase(key).publicKeyMultibase);
      return;
    }
    default:
      throw new Error("Usage: npm run signing-key -- new | register | rotate | show");
  }
}

main(process.argv[2]).catch((error) => {
  console.error(error instanceof Error ? error.message : String(error));
  process.exit(1);
});

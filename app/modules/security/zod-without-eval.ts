// Zod compiles object parsers with `new Function` when it may; our Content-Security-Policy forbids eval,
// so in the browser it is told not to try (the try alone is reported as a violation). Imported first by
// root.tsx, before any schema is built.
import { z } from "zod";

if (typeof document !== "undefined") z.config({ jitless: true });

// The two steps of a browser upload, as zod schemas for the upload resource routes.
import { z } from "zod";
import { decimalAmount, safeName, safeText } from "~/modules/validation/text";

export const uploadStepSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("presign"),
    fileName: safeName({ label: "file name", max: 255 }),
    size: decimalAmount({ label: "file size", decimals: 0 }).pipe(z.number().positive({ error: "The file is empty: choose a file with something in it." })),
    contentType: safeText({ label: "file type", max: 100 }),
  }),
  z.object({
    intent: z.literal("confirm"),
    fileName: safeName({ label: "file name", max: 255 }),
    uploadKey: safeText({ label: "upload key", max: 200 }),
  }),
]);

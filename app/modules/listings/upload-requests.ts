// The two steps of a browser upload, as zod schemas for the upload resource routes.
import { z } from "zod";
import { fileSize, safeName, safeText } from "~/modules/validation/text";

export const uploadStepSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("presign"),
    fileName: safeName({ label: "file name", max: 255 }),
    size: fileSize(),
    contentType: safeText({ label: "file type", max: 100 }),
  }),
  z.object({
    intent: z.literal("confirm"),
    fileName: safeName({ label: "file name", max: 255 }),
    uploadKey: safeText({ label: "upload key", max: 200 }),
  }),
]);

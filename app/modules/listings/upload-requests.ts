// The two steps of a browser upload, as zod schemas for the upload resource routes.
import { z } from "zod";

export const uploadStepSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("presign"),
    fileName: z.string().trim().min(1).max(255),
    size: z.coerce.number().int().positive({ error: "The file is empty: choose a file with something in it." }),
    contentType: z.string().max(100),
  }),
  z.object({
    intent: z.literal("confirm"),
    fileName: z.string().trim().min(1).max(255),
    uploadKey: z.string().max(200),
  }),
]);

// Answers the upload resource routes in JSON: expected refusals are 422 with a message for the person.
import type { Database } from "~/db/client.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { StorageUnavailableError } from "~/modules/files/storage.server";
import {
  confirmDocumentUpload,
  confirmPhotoUpload,
  RejectedFileError,
  startDocumentUpload,
  startPhotoUpload,
} from "./service.server";
import { uploadStepSchema } from "./upload-requests";

export async function handleUploadStep(db: Database, actor: SessionUser, listingId: string, kind: "photo" | "document", form: FormData) {
  const step = uploadStepSchema.safeParse(Object.fromEntries(form));
  if (!step.success) {
    // An empty file is the seller's to fix; anything else wrong here means the page is stale or tampered with.
    const emptyFile = step.error.issues.find((issue) => issue.path[0] === "size" && issue.code === "too_small");
    if (emptyFile) return Response.json({ error: emptyFile.message }, { status: 422 });
    return Response.json({ error: "This upload request is incomplete. Reload the page and try again." }, { status: 400 });
  }
  try {
    if (step.data.intent === "presign") {
      const file = { fileName: step.data.fileName, size: step.data.size, contentType: step.data.contentType };
      return Response.json(kind === "photo" ? await startPhotoUpload(db, actor, listingId, file) : await startDocumentUpload(db, actor, listingId, file));
    }
    const upload = { uploadKey: step.data.uploadKey, fileName: step.data.fileName };
    const stored = kind === "photo" ? await confirmPhotoUpload(db, actor, listingId, upload) : await confirmDocumentUpload(db, actor, listingId, upload);
    return Response.json({ [kind]: stored });
  } catch (error) {
    if (error instanceof RejectedFileError) return Response.json({ error: error.message }, { status: 422 });
    if (error instanceof StorageUnavailableError) return Response.json({ error: error.message }, { status: 503 });
    throw error;
  }
}

import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { FileUploader } from "~/components/listings/file-uploader";
import { ListingForm } from "~/components/listings/listing-form";
import { StatusBadge } from "~/components/listings/status-badge";
import { Badge, Button, ButtonLink, Card, CardBody, CardHeader } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { DOCUMENT_MAX_BYTES, DOCUMENT_TYPES, documentLimitText, PHOTO_MAX_BYTES, PHOTO_TYPES, photoLimitText, PHOTOS_PER_LISTING } from "~/modules/files/limits";
import { requireSeller } from "~/modules/listings/access.server";
import { formValuesOf } from "~/modules/listings/form-values";
import {
  changeListingStatus,
  deleteDocument,
  deleteDraftListing,
  deletePhoto,
  getListingForEditing,
  ListingRuleError,
  movePhoto,
  setPhotoCaption,
  updateListing,
} from "~/modules/listings/service.server";
import { listingFormSchema, PHOTO_CAPTION_MAX, photoCaptionSchema } from "~/modules/listings/validation";
import type { Route } from "./+types/sell-edit";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data ? `${data.listing.make} ${data.listing.model}` : "Listing"} — Tenthmark` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const seller = await requireSeller(request);
  const { listing, photos, documents } = await getListingForEditing(context.get(databaseContext), seller, params.listingId);
  const notice = new URL(request.url).searchParams.get("notice");
  return {
    units: seller.displayUnits,
    listing: { id: listing.id, slug: listing.slug, status: listing.status, make: listing.make, model: listing.model },
    formValues: formValuesOf(listing, seller.displayUnits),
    photos,
    documents,
    notice,
  };
}

const otherIntents = z.discriminatedUnion("intent", [
  z.object({ intent: z.enum(["publish", "mark-sold", "withdraw", "delete"]) }),
  z.object({ intent: z.enum(["photo-earlier", "photo-later", "photo-cover", "photo-delete"]), photoId: z.uuid() }),
  z.object({ intent: z.literal("document-delete"), documentId: z.uuid() }),
  z.object({ intent: z.literal("photo-caption"), photoId: z.uuid(), caption: photoCaptionSchema }),
]);

const notices = {
  created: "Draft saved. Add photos next; a listing needs at least one to be published.",
  saved: "Changes saved.",
  publish: "Published. Buyers can find it on the Machines page now.",
  "mark-sold": "Marked as sold. The listing stays visible, marked sold, and takes no more questions.",
  withdraw: "Withdrawn. Buyers no longer see it; you can publish it again.",
} as const;

export async function action({ request, params, context }: Route.ActionArgs) {
  const seller = await requireSeller(request);
  const db = context.get(databaseContext);
  const formData = await request.formData();
  const here = `/sell/listings/${params.listingId}`;

  if (formData.get("intent") === "save") {
    const submission = parseWithZod(formData, { schema: listingFormSchema(seller.displayUnits) });
    if (submission.status !== "success") return data({ formResult: submission.reply(), problem: null }, { status: 422 });
    await updateListing(db, seller, params.listingId, submission.value);
    return redirect(`${here}?notice=saved`);
  }

  const parsed = otherIntents.safeParse(Object.fromEntries(formData));
  if (!parsed.success) {
    // A caption the seller typed wrong is theirs to fix (422 with its message); anything else is a stale or tampered page.
    const captionProblem = formData.get("intent") === "photo-caption" ? parsed.error.issues.find((issue) => issue.path[0] === "caption") : undefined;
    if (captionProblem) return data({ formResult: null, problem: captionProblem.message }, { status: 422 });
    return data({ formResult: null, problem: "That request was not understood. Reload the page and try again." }, { status: 400 });
  }
  const request_ = parsed.data;
  try {
    switch (request_.intent) {
      case "publish":
      case "mark-sold":
      case "withdraw":
        await changeListingStatus(db, seller, params.listingId, request_.intent);
        return redirect(`${here}?notice=${request_.intent}`);
      case "delete":
        await deleteDraftListing(db, seller, params.listingId);
        return redirect("/sell?notice=deleted");
      case "photo-delete":
        await deletePhoto(db, seller, params.listingId, request_.photoId);
        return redirect(`${here}#photos`);
      case "photo-earlier":
      case "photo-later":
      case "photo-cover":
        await movePhoto(db, seller, params.listingId, request_.photoId, request_.intent.replace("photo-", "") as "earlier" | "later" | "cover");
        return redirect(`${here}#photos`);
      case "photo-caption":
        await setPhotoCaption(db, seller, params.listingId, request_.photoId, request_.caption);
        return redirect(`${here}#photos`);
      case "document-delete":
        await deleteDocument(db, seller, params.listingId, request_.documentId);
        return redirect(`${here}#documents`);
    }
  } catch (error) {
    if (error instanceof ListingRuleError) return data({ formResult: null, problem: error.message }, { status: 422 });
    throw error;
  }
}

export default function EditListing({ loaderData, actionData }: Route.ComponentProps) {
  const { listing, photos, documents, units, formValues, notice } = loaderData;
  const noticeText = notice && notice in notices ? notices[notice as keyof typeof notices] : null;
  const isPublic = listing.status === "published" || listing.status === "sold";
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
        <Link to="/sell" className="font-semibold hover:text-ink-900">
          Your listings
        </Link>{" "}
        / {listing.make} {listing.model}
      </nav>
      <div className="mt-2 flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-extrabold text-ink-900 sm:text-3xl">
          {listing.make} {listing.model}
        </h1>
        <StatusBadge status={listing.status} />
      </div>

      {noticeText ? (
        <p role="status" className="mt-4 rounded-control border border-within/30 bg-within-soft px-4 py-3 text-sm font-medium text-within">
          {noticeText}
        </p>
      ) : null}
      {actionData?.problem ? (
        <p role="alert" className="mt-4 rounded-control border border-beyond/30 bg-beyond-soft px-4 py-3 text-sm font-medium text-beyond">
          {actionData.problem}
        </p>
      ) : null}

      {/* Phone order: status, photos, details, documents; on a wide screen status and documents sit on the right. */}
      <div className="mt-6 grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_22rem] lg:grid-rows-[auto_auto_1fr]">
        <div className="lg:col-start-2 lg:row-start-1">
          <StatusCard status={listing.status} slug={listing.slug} photoCount={photos.length} isPublic={isPublic} />
        </div>
        <aside className="lg:col-start-2 lg:row-start-2">
          <Card id="documents" className="scroll-mt-20">
            <CardHeader title="Documents" description="Manuals, earlier inspection reports, rebuild records." />
            <CardBody className="space-y-4">
              {documents.length ? (
                <ul className="divide-y divide-ink-100">
                  {documents.map((document) => (
                    <li key={document.id} className="flex items-center justify-between gap-3 py-2 text-sm">
                      <a href={document.url} className="min-w-0 truncate font-semibold text-ink-800 underline underline-offset-2" target="_blank" rel="noreferrer">
                        {document.title}
                      </a>
                      <span className="flex shrink-0 items-center gap-2 text-ink-500">
                        {document.size}
                        <Form method="post" preventScrollReset>
                          <input type="hidden" name="documentId" value={document.id} />
                          <Button type="submit" name="intent" value="document-delete" variant="quiet" size="sm" aria-label={`Delete ${document.title}`}>
                            Delete
                          </Button>
                        </Form>
                      </span>
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="text-sm text-ink-500">No documents yet.</p>
              )}
              <FileUploader
                endpoint={`/sell/listings/${listing.id}/documents`}
                accept={DOCUMENT_TYPES}
                maxBytes={DOCUMENT_MAX_BYTES}
                limitText={documentLimitText}
                label="Add PDF documents"
              />
            </CardBody>
          </Card>
        </aside>

        <div className="min-w-0 space-y-6 lg:col-start-1 lg:row-span-3 lg:row-start-1">
          <Card id="photos" className="scroll-mt-20">
            <CardHeader
              title="Photos"
              description={`The first photo is the cover. Up to ${PHOTOS_PER_LISTING}; we remove location and camera data from every photo.`}
            />
            <CardBody className="space-y-5">
              {photos.length ? (
                <ol className="grid grid-cols-2 gap-4 sm:grid-cols-3" aria-label="Photos in gallery order">
                  {photos.map((photo, index) => (
                    <li key={photo.id} className="overflow-hidden rounded-control border border-ink-200 bg-white">
                      <div className="relative">
                        <img src={photo.thumbnailUrl} alt={`Photo ${index + 1}: ${photo.originalName}`} className="aspect-[4/3] w-full object-cover" width={480} height={360} />
                        {index === 0 ? (
                          <Badge tone="brass" className="absolute left-2 top-2">
                            Cover
                          </Badge>
                        ) : null}
                      </div>
                      <Form method="post" preventScrollReset className="flex items-end gap-1 px-2 pt-2">
                        <input type="hidden" name="photoId" value={photo.id} />
                        <label className="min-w-0 flex-1 text-xs font-semibold text-ink-700">
                          Caption of photo {index + 1}
                          <input
                            name="caption"
                            defaultValue={photo.caption ?? ""}
                            maxLength={PHOTO_CAPTION_MAX}
                            placeholder="e.g. Bed ways at the chuck end"
                            className="mt-1 block w-full rounded-control border border-ink-300 bg-white px-2 py-1 text-sm font-normal text-ink-900"
                          />
                        </label>
                        <Button type="submit" name="intent" value="photo-caption" variant="secondary" size="sm" aria-label={`Save the caption of photo ${index + 1}`}>
                          Save
                        </Button>
                      </Form>
                      <Form method="post" preventScrollReset className="flex flex-wrap items-center gap-1 p-2">
                        <input type="hidden" name="photoId" value={photo.id} />
                        <Button type="submit" name="intent" value="photo-earlier" variant="quiet" size="sm" disabled={index === 0} aria-label={`Move photo ${index + 1} earlier`}>
                          ←
                        </Button>
                        <Button type="submit" name="intent" value="photo-later" variant="quiet" size="sm" disabled={index === photos.length - 1} aria-label={`Move photo ${index + 1} later`}>
                          →
                        </Button>
                        {index > 0 ? (
                          <Button type="submit" name="intent" value="photo-cover" variant="quiet" size="sm">
                            Make cover
                          </Button>
                        ) : null}
                        <Button type="submit" name="intent" value="photo-delete" variant="quiet" size="sm" className="ml-auto text-beyond" aria-label={`Delete photo ${index + 1}`}>
                          Delete
                        </Button>
                      </Form>
                    </li>
                  ))}
                </ol>
              ) : (
                <p className="text-sm text-ink-500">No photos yet. Show the whole machine, the bed ways, the headstock, the nameplate and the tooling.</p>
              )}
              <FileUploader endpoint={`/sell/listings/${listing.id}/photos`} accept={PHOTO_TYPES} maxBytes={PHOTO_MAX_BYTES} limitText={photoLimitText} label="Add photos" />
            </CardBody>
          </Card>

          <ListingForm units={units} defaultValue={formValues} lastResult={actionData?.formResult} submitLabel="Save changes" />
        </div>
      </div>
    </div>
  );
}

function StatusCard({ status, slug, photoCount, isPublic }: { status: string; slug: string; photoCount: number; isPublic: boolean }) {
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  return (
    <Card>
      <CardHeader title="Status" />
      <CardBody className="space-y-4 text-sm text-ink-700">
        <p>
          {status === "draft"
            ? photoCount
              ? "Draft: only you can see it. Publish when the details and photos are right."
              : "Draft: only you can see it. Add at least one photo to publish."
            : status === "published"
              ? "Published: buyers can find it and write to you."
              : status === "sold"
                ? "Sold: still visible, marked sold, and closed to questions."
                : "Withdrawn: hidden from buyers. You can publish it again."}
        </p>
        <Form method="post" className="flex flex-wrap gap-2">
          {status === "draft" || status === "withdrawn" ? (
            <Button type="submit" name="intent" value="publish" disabled={busy}>
              Publish
            </Button>
          ) : null}
          {status === "published" ? (
            <>
              <Button type="submit" name="intent" value="mark-sold" variant="secondary" disabled={busy}>
                Mark sold
              </Button>
              <Button type="submit" name="intent" value="withdraw" variant="secondary" disabled={busy}>
                Withdraw
              </Button>
            </>
          ) : null}
          {status === "draft" ? (
            <Button
              type="submit"
              name="intent"
              value="delete"
              variant="quiet"
              className="text-beyond"
              disabled={busy}
              onClick={(event) => {
                if (!window.confirm("Delete this draft with its photos and documents? This cannot be undone.")) event.preventDefault();
              }}
            >
              Delete draft
            </Button>
          ) : null}
        </Form>
        <ButtonLink to={`/machines/${slug}`} variant="quiet" size="sm" className="px-0 underline underline-offset-4">
          {isPublic ? "Open the public page" : "Preview the public page"}
        </ButtonLink>
      </CardBody>
    </Card>
  );
}

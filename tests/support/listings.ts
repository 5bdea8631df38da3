// Listings through the app under test, as a browser without JavaScript (or the upload script) would send them.
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import { listingPhotos, listings } from "~/modules/listings/schema";
import { testAppOrigin } from "./accounts";

/** A published centre lathe written straight to the database (no form, no photos), for tests of what reads listings. */
export async function insertPublishedLathe(sellerId: string, options: { slugPrefix: string; description: string; priceMinor?: number }) {
  const [row] = await getDatabase()
    .insert(listings)
    .values({
      sellerId,
      slug: `${options.slugPrefix}-${randomUUID().slice(0, 8)}`,
      status: "published",
      category: "centre_lathe",
      make: "Varnholt",
      model: `VL ${Math.floor(Math.random() * 900) + 100}`,
      city: "Brennwald",
      country: "DE",
      priceMinor: options.priceMinor ?? 1_200_000,
      currency: "EUR",
      condition: "used",
      description: options.description,
      publishedAt: new Date(),
    })
    .returning();
  return row!;
}

/** A complete, valid centre lathe in millimetres; override single fields to break them. */
export function validListingFields(overrides: Record<string, string> = {}): Record<string, string> {
  return {
    intent: "save",
    units: "mm",
    category: "centre_lathe",
    make: "Halvorsen",
    model: "ML 280",
    year: "1987",
    serialNumber: "ML280-4471",
    swingOverBed: "280",
    distanceBetweenCentres: "750",
    spindleBore: "38",
    spindleNose: "D1-4 camlock",
    motorPower: "2.2",
    weight: "780",
    city: "Eskerud",
    region: "Vestmark",
    country: "NO",
    price: "9400",
    currency: "EUR",
    condition: "reconditioned",
    toolingIncluded: "3-jaw and 4-jaw chucks, faceplate, fixed steady",
    description: "Reground bed and new spindle bearings in 2024; runs quietly through all speeds.",
    ...overrides,
  };
}

/** The trade's finer figures of that lathe (supply, speeds, tailstock, threads, cross-slide, footprint), in millimetres. */
export const tradeSpecFields: Readonly<Record<string, string>> = {
    supplyVoltage: "400",
    supplyPhases: "3",
    supplyFrequency: "50",
    spindleSpeedMin: "40",
    spindleSpeedMax: "2000",
    tailstockTaper: "Morse taper 3",
    threadPitchMin: "0.25",
    threadPitchMax: "7",
    threadTpiMin: "4",
    threadTpiMax: "56",
    swingOverCrossSlide: "170",
    footprintLength: "1800",
    footprintWidth: "800",
};

export function formBody(fields: Record<string, string>) {
  const body = new FormData();
  for (const [key, value] of Object.entries(fields)) body.set(key, value);
  return body;
}

export async function postForm(path: string, cookie: string, fields: Record<string, string>) {
  return fetch(`${testAppOrigin}${path}`, {
    method: "POST",
    body: formBody(fields),
    headers: { cookie, origin: testAppOrigin },
    redirect: "manual",
  });
}

/** Creates a listing through POST /sell/new and returns its id. */
export async function createListingAs(cookie: string, overrides: Record<string, string> = {}) {
  const response = await postForm("/sell/new", cookie, validListingFields(overrides));
  if (response.status !== 302) throw new Error(`creating a listing answered ${response.status}: ${(await response.text()).slice(0, 300)}`);
  const id = /\/sell\/listings\/([0-9a-f-]{36})/.exec(response.headers.get("location") ?? "")?.[1];
  if (!id) throw new Error(`no listing id in ${response.headers.get("location")}`);
  return id;
}

/** Presign, PUT and confirm, as the upload script does; returns the confirm response and its JSON. */
export async function uploadFileAs(
  cookie: string,
  listingId: string,
  kind: "photos" | "documents",
  file: { bytes: Buffer; name: string; type: string; declaredSize?: number },
) {
  const endpoint = `/sell/listings/${listingId}/${kind}`;
  const presign = await postForm(endpoint, cookie, {
    intent: "presign",
    fileName: file.name,
    size: String(file.declaredSize ?? file.bytes.length),
    contentType: file.type,
  });
  const ticket = (await presign.json()) as Record<string, any>;
  if (presign.status !== 200) return { step: "presign" as const, status: presign.status, body: ticket };
  const put = await fetch(ticket.uploadUrl!, { method: "PUT", body: new Uint8Array(file.bytes), headers: { "content-type": file.type } });
  if (put.status !== 200) throw new Error(`storage refused the PUT: ${put.status}`);
  const confirm = await postForm(endpoint, cookie, { intent: "confirm", fileName: file.name, uploadKey: ticket.uploadKey! });
  return { step: "confirm" as const, status: confirm.status, body: (await confirm.json()) as Record<string, any>, uploadKey: ticket.uploadKey! };
}

let s3: S3Client | undefined;
/** Every object key in the bucket under `prefix` (tests look here to prove nothing was left behind). */
export async function objectKeysUnder(prefix: string) {
  s3 ??= new S3Client({
    endpoint: process.env.S3_ENDPOINT,
    region: process.env.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID!, secretAccessKey: process.env.S3_SECRET_ACCESS_KEY! },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  const listed = await s3.send(new ListObjectsV2Command({ Bucket: process.env.S3_BUCKET, Prefix: prefix }));
  return (listed.Contents ?? []).map((object) => object.Key!);
}

export async function listingRow(id: string) {
  const [row] = await getDatabase().select().from(listings).where(eq(listings.id, id));
  return row;
}

export async function listingsOfSeller(sellerId: string) {
  return getDatabase().select().from(listings).where(eq(listings.sellerId, sellerId));
}

export async function photoRows(listingId: string) {
  return getDatabase().select().from(listingPhotos).where(eq(listingPhotos.listingId, listingId));
}

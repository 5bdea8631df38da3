// Inputs of the inspections pages, one zod schema per form, shared by the form and the server.
import { z } from "zod";
import { labelOf, machineCategories, type MachineCategory } from "~/modules/listings/catalogue";
import { currencies } from "~/modules/units/format";
import { formId, safeName, safeText } from "~/modules/validation/text";

/** Machine categories an inspector can serve: the same values and words as a listing's category. */
export const inspectionCategories = machineCategories.map((category) => category.value) as [MachineCategory, ...MachineCategory[]];
export type InspectionCategory = MachineCategory;

export function categoryLabel(category: string): string {
  return labelOf(machineCategories, category);
}

const trimmed = (label: string, max: number, multiline = false) => safeText({ label, max, multiline, messages: { tooLong: `must be at most ${max} characters` } });

/** A fee typed as major units ("350" or "350.50"), kept in minor units. */
const feeField = z
  .string()
  .trim()
  .regex(/^\d{1,6}([.,]\d{1,2})?$/, { error: "Enter the fee as a number, e.g. 350 or 350.50" })
  .transform((value) => Math.round(Number(value.replace(",", ".")) * 100))
  .refine((minor) => minor >= 1000, { error: "A fee must be at least 10.00" });

export const profileSchema = z.object({
  headline: safeName({ label: "headline", max: 120, messages: { tooLong: "must be at most 120 characters" } }).min(3, { error: "Give a one-line headline, e.g. 'Lathe rebuilder, 20 years'" }),
  bio: trimmed("bio", 4000, true).min(20, { error: "Tell buyers about your experience in at least a few sentences" }),
  qualifications: trimmed("qualifications", 2000, true).min(3, { error: "List your qualifications" }),
  baseCity: safeName({ label: "base town or city", max: 120, messages: { tooLong: "must be at most 120 characters" } }).min(2, { error: "Where do you travel from?" }),
  regions: z
    .string()
    .transform((value) =>
      [...new Set(value.split(/[\n,;]/).map((region) => region.trim()).filter(Boolean))],
    )
    .pipe(z.array(safeName({ label: "region", max: 80 })).min(1, { error: "Name at least one region or country you travel to" }).max(30)),
  currency: z.enum(currencies, { error: "Choose a currency" }),
  categories: z.array(z.enum(inspectionCategories)).min(1, { error: "Choose at least one category of machine" }),
  fees: z.partialRecord(z.enum(inspectionCategories), z.string().max(40)),
});

/** Parses the profile form: one checkbox per category, one fee field per category (`fee.<category>`). */
export function parseProfileForm(form: FormData) {
  const fees: Record<string, string> = {};
  for (const category of inspectionCategories) {
    const value = form.get(`fee.${category}`);
    if (typeof value === "string") fees[category] = value;
  }
  const parsed = profileSchema.safeParse({
    headline: form.get("headline") ?? "",
    bio: form.get("bio") ?? "",
    qualifications: form.get("qualifications") ?? "",
    baseCity: form.get("baseCity") ?? "",
    regions: form.get("regions") ?? "",
    currency: form.get("currency") ?? "",
    categories: form.getAll("categories"),
    fees,
  });
  if (!parsed.success) return { errors: z.flattenError(parsed.error).fieldErrors as Record<string, string[]> } as const;
  const errors: Record<string, string[]> = {};
  const feeMinorByCategory: Partial<Record<InspectionCategory, number>> = {};
  for (const category of parsed.data.categories) {
    const fee = feeField.safeParse(parsed.data.fees[category] ?? "");
    if (fee.success) feeMinorByCategory[category] = fee.data;
    else errors[`fee.${category}`] = [fee.error.issues[0]?.message ?? "Enter a fee"];
  }
  if (Object.keys(errors).length) return { errors } as const;
  const { fees: _typed, ...profile } = parsed.data;
  return { value: { ...profile, feeMinorByCategory } } as const;
}

export type ProfileInput = Extract<ReturnType<typeof parseProfileForm>, { value: unknown }>["value"];

export const SLOT_DURATIONS = [120, 180, 240, 360, 480] as const;

export const slotSchema = z.object({
  date: z.iso.date({ error: "Choose a day" }),
  startTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: "Enter a start time, e.g. 08:30" }),
  durationMinutes: z.coerce
    .number()
    .int()
    .refine((minutes) => (SLOT_DURATIONS as readonly number[]).includes(minutes), { error: "Choose a duration" }),
  /** The browser's offset from UTC in minutes (Date#getTimezoneOffset), so "08:30" means the inspector's 08:30. */
  timezoneOffset: z.coerce.number().int().min(-840).max(840).default(0),
  repeatWeeks: z.coerce.number().int().min(1, { error: "At least once" }).max(12, { error: "At most 12 weeks ahead" }).default(1),
});

export type SlotInput = z.infer<typeof slotSchema>;

export const bookingRequestSchema = z.object({
  inspectorId: safeText({ label: "inspector", max: 100, min: 1, messages: { missing: "Choose an inspector" } }),
  slotId: formId("slot"),
  acceptTerms: z.literal("on", { error: "Confirm that you have read the refund rules" }),
});

export const declineSchema = z.object({
  reason: safeText({ label: "reason", max: 1000, multiline: true }).min(5, { error: "Say briefly why, so the buyer can book someone else" }),
});

export const cancelSchema = z.object({
  reason: safeText({ label: "reason", max: 1000, multiline: true }).default(""),
});

export const adminRefundSchema = z.object({
  amount: z
    .string()
    .trim()
    .regex(/^\d{1,6}([.,]\d{1,2})?$/, { error: "Enter the amount, e.g. 120 or 120.50" })
    .transform((value) => Math.round(Number(value.replace(",", ".")) * 100))
    .refine((minor) => minor > 0, { error: "Enter an amount above zero" }),
  reason: safeText({ label: "reason", max: 1000, multiline: true }).min(5, { error: "Write down why this refund is given" }),
});

/** Where the machine stands and who lets the inspector in (the seller's, shown to the booking's parties only). */
export const machineSiteSchema = z.object({
  streetAddress: safeName({ label: "street address", max: 300, multiline: true }).refine((value) => value.length >= 5, { error: "Give the street, number, postcode and town." }),
  contactName: safeName({ label: "contact person", max: 120 }),
  contactPhone: safeName({ label: "phone number", max: 40 }).refine((value) => /^\+?[0-9][0-9 ()./-]{4,38}$/.test(value), {
    error: "Give a phone number in digits, e.g. +49 30 1234 5678.",
  }),
  accessNotes: safeText({ label: "access notes", max: 1000, multiline: true }).default(""),
});
export type MachineSiteInput = z.infer<typeof machineSiteSchema>;

/** A new time for an accepted visit, as a day and start time where the machine stands, and how long. */
export const rescheduleSchema = z.object({
  date: z.iso.date({ error: "Choose a day" }),
  startTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: "Enter a start time, e.g. 08:30" }),
  durationMinutes: z.coerce
    .number({ error: "Choose a duration" })
    .int()
    .refine((minutes) => (SLOT_DURATIONS as readonly number[]).includes(minutes), { error: "Choose a duration" }),
  reason: safeText({ label: "reason", max: 500, multiline: true }).default(""),
});

export const rescheduleDecisionSchema = z.object({
  requestId: formId("request"),
  decision: z.enum(["accept", "decline", "withdraw"], { error: "Accept, decline or withdraw the request." }),
});

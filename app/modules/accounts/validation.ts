// Form schemas of the accounts pages, shared by Conform in the browser and the actions on the server.
import { z } from "zod";
import { formId, safeName, safeText } from "~/modules/validation/text";

export const ROLES = ["buyer", "seller", "inspector", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const DISPLAY_UNITS = ["mm", "inch"] as const;
export type DisplayUnits = (typeof DISPLAY_UNITS)[number];

// The machine categories an inspector can serve; the same values as listings' machine_category.
export const INSPECTION_CATEGORIES = [
  { value: "centre_lathe", label: "Centre lathes" },
  { value: "toolroom_lathe", label: "Toolroom lathes" },
  { value: "cnc_lathe", label: "CNC lathes" },
  { value: "milling_machine", label: "Milling machines" },
  { value: "surface_grinder", label: "Surface grinders" },
] as const;
const categoryValues = INSPECTION_CATEGORIES.map((category) => category.value) as [string, ...string[]];

// 254 characters is the longest address SMTP can carry (RFC 5321's 256-octet path less the angle brackets).
export const emailAddress = safeText({ label: "e-mail address", max: 254, messages: { missing: "Enter your e-mail address.", tooLong: "Enter an e-mail address of at most 254 characters." } })
  .toLowerCase()
  .pipe(z.email({ error: "Enter an e-mail address like name@example.com." }));
const email = emailAddress;

const newPassword = z
  .string({ error: "Choose a password." })
  .min(10, { error: "Use at least 10 characters." })
  .max(128, { error: "Use at most 128 characters." });

const name = safeName({
  label: "name",
  max: 80,
  min: 2,
  messages: { missing: "Enter your name or your company's.", tooShort: "Enter at least 2 characters.", tooLong: "Use at most 80 characters." },
});

/** A same-site path to go back to after signing in; anything else falls back to the home page. */
export const redirectTo = z
  .string()
  .optional()
  .transform((value) => (value && value.startsWith("/") && !value.startsWith("//") && !value.startsWith("/\\") ? value : undefined));

export const signUpSchema = z.object({
  name,
  email,
  password: newPassword,
  buys: z.boolean().default(false),
  sells: z.boolean().default(false),
  inspects: z.boolean().default(false),
  redirectTo,
});

export const signInSchema = z.object({
  email,
  password: z.string({ error: "Enter your password." }).min(1, { error: "Enter your password." }).max(128, { error: "Passwords here have at most 128 characters." }),
  redirectTo,
});

export const forgotPasswordSchema = z.object({ email });

export const resetPasswordSchema = z
  .object({
    token: safeText({ label: "token", max: 500, min: 1, messages: { missing: "The link is missing its token: open it again from the e-mail." } }),
    password: newPassword,
    confirmPassword: z.string({ error: "Type the new password again." }),
  })
  .refine((value) => value.password === value.confirmPassword, { path: ["confirmPassword"], error: "The two passwords differ." });

export const resendVerificationSchema = z.object({ redirectTo });

export const profileSchema = z.object({
  intent: z.literal("profile"),
  name,
  displayUnits: z.enum(DISPLAY_UNITS, { error: "Choose millimetres or inches." }),
});

export const changePasswordSchema = z
  .object({
    intent: z.literal("password"),
    currentPassword: z.string({ error: "Enter your current password." }).min(1, { error: "Enter your current password." }).max(128, { error: "Passwords here have at most 128 characters." }),
    newPassword,
    confirmPassword: z.string({ error: "Type the new password again." }),
  })
  .refine((value) => value.newPassword === value.confirmPassword, { path: ["confirmPassword"], error: "The two passwords differ." });

export const accountSettingsSchema = z.discriminatedUnion("intent", [profileSchema, changePasswordSchema]);

const listOfPlaces = z
  .string({ error: "Name at least one region you travel to." })
  .transform((value) =>
    value
      .split(/[\n,;]+/)
      .map((part) => part.trim())
      .filter(Boolean),
  )
  .pipe(
    z
      .array(safeName({ label: "region", max: 80, messages: { tooLong: "Keep each region under 80 characters." } }))
      .min(1, { error: "Name at least one region you travel to." })
      .max(30, { error: "Name at most 30 regions." }),
  );

export const inspectorApplicationSchema = z.object({
  qualifications: safeText({
    label: "description of your training",
    max: 4000,
    min: 40,
    multiline: true,
    messages: {
      missing: "Describe your training and experience.",
      tooShort: "Tell us a little more (at least 40 characters): training, years at the trade, instruments you own.",
      tooLong: "Keep it under 4000 characters.",
    },
  }),
  regions: listOfPlaces,
  categories: z
    .array(z.enum(categoryValues, { error: "Choose from the list." }), { error: "Choose at least one kind of machine." })
    .min(1, { error: "Choose at least one kind of machine." }),
});

export const applicationDecisionSchema = z
  .object({
    applicationId: formId("application"),
    decision: z.enum(["approve", "reject"], { error: "Approve or reject." }),
    reason: safeText({ label: "reason", max: 1000, multiline: true, messages: { tooLong: "Keep the reason under 1000 characters." } }).optional(),
  })
  .refine((value) => value.decision === "approve" || (value.reason && value.reason.length >= 5), {
    path: ["reason"],
    error: "Give the applicant a reason (at least 5 characters).",
  });

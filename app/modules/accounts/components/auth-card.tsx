import type { FieldMetadata } from "@conform-to/react";
import type { ReactNode } from "react";
import { Card, TextField } from "~/components/ui";

/** The frame of the sign-in, sign-up and password pages: one centred card with a title. */
export function AuthCard({ title, lead, children, footer, wide }: { title: string; lead?: ReactNode; children: ReactNode; footer?: ReactNode; wide?: boolean }) {
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6 sm:py-16">
      <div className={wide ? "mx-auto max-w-xl" : "mx-auto max-w-md"}>
        <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">{title}</h1>
        {lead ? <div className="mt-2 text-ink-600">{lead}</div> : null}
        <Card className="mt-6 p-5 sm:p-7">{children}</Card>
        {footer ? <div className="mt-5 text-sm text-ink-600">{footer}</div> : null}
      </div>
    </div>
  );
}

/** A message about the whole form (not one field), announced to screen readers. */
export function FormMessage({ tone = "beyond", children, id }: { tone?: "beyond" | "within" | "caution"; children: ReactNode; id?: string }) {
  const tones = {
    beyond: "border-beyond/30 bg-beyond-soft text-beyond",
    within: "border-within/30 bg-within-soft text-within",
    caution: "border-caution/30 bg-caution-soft text-caution",
  } as const;
  return (
    <div id={id} role={tone === "beyond" ? "alert" : "status"} className={`rounded-control border px-3 py-2.5 text-sm font-semibold ${tones[tone]}`}>
      {children}
    </div>
  );
}

/** The e-mail address field of the sign-in, sign-up and forgotten-password forms, wired to its Conform field. */
export function EmailAddressField({ field }: { field: FieldMetadata<string> }) {
  return (
    <TextField
      label="E-mail address"
      type="email"
      autoComplete="email"
      inputMode="email"
      name={field.name}
      key={field.key}
      defaultValue={field.initialValue}
      errors={field.errors}
      required
    />
  );
}

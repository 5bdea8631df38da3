// A buyer's question to the seller, on the listing page, loaded only for a signed-in visitor. The schema is
// checked by the page's action alone: the browser checks the limits the loader read from it (required,
// length), so that no schema ships in the page's script; the server's field messages come back through Conform.
import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { Form, useActionData, useNavigation } from "react-router";
import { Button, TextAreaField, TextField } from "~/components/ui";

export type InquiryConstraint = Record<string, { required?: boolean; minLength?: number; maxLength?: number; pattern?: string }>;
type InquiryAnswer = { inquiry: SubmissionResult<string[]> | null; sent: boolean } | undefined;

export function InquiryForm({ listingId, constraint }: { listingId: string; constraint: InquiryConstraint }) {
  const navigation = useNavigation();
  const actionData = useActionData<InquiryAnswer>();
  const [form, fields] = useForm<{ message: string; phone?: string }>({
    lastResult: navigation.state === "idle" ? actionData?.inquiry : null,
    constraint,
    shouldValidate: "onBlur",
  });
  const sending = navigation.state === "submitting" && navigation.formData?.get("intent") === "inquire";
  return (
    <Form method="post" {...getFormProps(form)} className="space-y-4" preventScrollReset>
      <input type="hidden" name="listingId" value={listingId} />
      {actionData?.sent ? (
        <p role="status" className="rounded-control bg-within-soft px-3 py-2 text-sm font-medium text-within">
          Sent. The seller has your message and your e-mail address.
        </p>
      ) : null}
      {form.errors?.length ? (
        <p role="alert" className="text-sm font-medium text-beyond">
          {form.errors.join(" ")}
        </p>
      ) : null}
      <TextAreaField
        label="Your question"
        rows={5}
        name={fields.message.name}
        defaultValue={fields.message.initialValue}
        errors={fields.message.errors}
        placeholder="Can I see it under power? Is the leadscrew original?"
      />
      <TextField label="Phone" hint="Optional" type="tel" autoComplete="tel" name={fields.phone.name} defaultValue={fields.phone.initialValue} errors={fields.phone.errors} />
      <Button type="submit" name="intent" value="inquire" className="w-full" disabled={sending}>
        {sending ? "Sending…" : "Send to the seller"}
      </Button>
    </Form>
  );
}

import { render } from "@react-email/render";
import type { ReactElement } from "react";

/** An e-mail's HTML part and its plain-text twin, from one React Email element. */
export async function renderEmail(element: ReactElement): Promise<{ html: string; text: string }> {
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true })]);
  return { html, text };
}

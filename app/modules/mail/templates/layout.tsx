import { Body, Container, Head, Hr, Html, Link, Preview, Section, Text } from "@react-email/components";
import type { ReactNode } from "react";

// The name mark's colours (app/app.css): ink for text, brass for the accent. E-mail clients ignore CSS
// variables, so they are written out here.
export const emailColours = {
  ink900: "#17212b",
  ink600: "#4b5d6c",
  ink200: "#d7dde2",
  ink50: "#f5f6f7",
  brass600: "#9a6512",
  brass400: "#d49a35",
  paper: "#fbfaf7",
} as const;

const font = 'Manrope, "Segoe UI", Helvetica, Arial, sans-serif';

/** The frame of every Tenthmark e-mail: name mark, the message, and a footer saying why it was sent. */
export function EmailLayout({ preview, children, reason }: { preview: string; children: ReactNode; reason: string }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={{ backgroundColor: emailColours.ink50, fontFamily: font, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: "#ffffff", border: `1px solid ${emailColours.ink200}`, borderRadius: 10, maxWidth: 560, padding: "28px 32px" }}>
          <Section>
            <Text style={{ fontSize: 20, fontWeight: 800, letterSpacing: "-0.01em", color: emailColours.ink900, margin: 0 }}>
              Tenth<span style={{ color: emailColours.brass600 }}>mark</span>
            </Text>
            <div style={{ height: 3, width: 40, backgroundColor: emailColours.brass400, borderRadius: 2, marginTop: 6 }} />
          </Section>
          <Section style={{ marginTop: 20 }}>{children}</Section>
          <Hr style={{ borderColor: emailColours.ink200, margin: "28px 0 12px" }} />
          <Text style={{ fontSize: 12, lineHeight: "18px", color: emailColours.ink600, margin: 0 }}>{reason}</Text>
        </Container>
      </Body>
    </Html>
  );
}

export function EmailHeading({ children }: { children: ReactNode }) {
  return <Text style={{ fontSize: 22, fontWeight: 800, color: emailColours.ink900, margin: "0 0 12px" }}>{children}</Text>;
}

export function EmailParagraph({ children }: { children: ReactNode }) {
  return <Text style={{ fontSize: 15, lineHeight: "24px", color: emailColours.ink900, margin: "0 0 14px" }}>{children}</Text>;
}

/** A set-off block with the brass rule on its left: a quoted message, or the machine an alert is about. */
export function EmailPanel({ children, keepLineBreaks = false }: { children: ReactNode; keepLineBreaks?: boolean }) {
  return (
    <Text
      style={{
        fontSize: 15,
        lineHeight: "24px",
        color: emailColours.ink900,
        backgroundColor: emailColours.ink50,
        borderLeft: `3px solid ${emailColours.brass400}`,
        padding: "10px 14px",
        ...(keepLineBreaks ? { whiteSpace: "pre-wrap" } : {}),
        margin: "0 0 14px",
      }}
    >
      {children}
    </Text>
  );
}

/** A call to action as a button, with the address written out below for clients that block links. */
export function EmailAction({ href, children }: { href: string; children: ReactNode }) {
  return (
    <Section style={{ margin: "20px 0" }}>
      <Link
        href={href}
        style={{ backgroundColor: emailColours.ink900, color: "#ffffff", borderRadius: 6, padding: "12px 20px", fontSize: 15, fontWeight: 700, textDecoration: "none", display: "inline-block" }}
      >
        {children}
      </Link>
      <Text style={{ fontSize: 12, lineHeight: "18px", color: emailColours.ink600, margin: "12px 0 0", wordBreak: "break-all" }}>
        Or open this address: {href}
      </Text>
    </Section>
  );
}

import { env } from "~/env.server";

export function reportUrl(reportId: string) {
  return `${env().APP_ORIGIN}/reports/${reportId}`;
}

/** Where the QR code points: the public check of a hash. */
export function verificationUrl(hash: string) {
  return `${env().APP_ORIGIN}/reports/verify?hash=${hash}`;
}

import { type RouteConfig, index, route } from "@react-router/dev/routes";

// Every URL of the product, in one place.
export default [
  index("routes/home.tsx"),
  route("how-scoring-works", "routes/how-scoring-works.tsx"),

  // Accounts
  route("sign-up", "routes/accounts/sign-up.tsx"),
  route("sign-in", "routes/accounts/sign-in.tsx"),
  route("sign-out", "routes/accounts/sign-out.ts"),
  route("forgot-password", "routes/accounts/forgot-password.tsx"),
  route("reset-password", "routes/accounts/reset-password.tsx"),
  route("verify-email", "routes/accounts/verify-email.tsx"),
  route("account", "routes/accounts/settings.tsx"),
  route("account/inspector", "routes/accounts/inspector-application.tsx"),

  // Staff
  route("admin/users", "routes/admin/users.tsx"),
  route("admin/inspector-applications", "routes/admin/inspector-applications.tsx"),
  route("admin/inspector-demand", "routes/admin/inspector-demand.tsx"),
  route("admin/profiles", "routes/admin/profiles.tsx"),
  route("admin/profiles/:key/:version", "routes/admin/profile-version.tsx"),
  route("admin/profiles/:key/:version/settings", "routes/admin/profile-settings.tsx"),
  route("admin/profiles/:key/:version/tests/:code", "routes/admin/profile-test.tsx"),

  // Search: buyers find machines by verified accuracy, save searches and hear about new matches
  route("machines", "routes/search/machines.tsx"),
  route("account/saved-searches", "routes/search/saved-searches.tsx"),
  route("saved-searches/unsubscribe", "routes/search/unsubscribe.tsx"),

  // Listings: buyers browse, sellers manage
  route("compare", "routes/listings/compare.tsx"),
  route("machines/:slug", "routes/listings/machine.tsx"),
  route("sellers/:publicId", "routes/listings/seller.tsx"),
  route("sell", "routes/listings/sell-dashboard.tsx"),
  route("sell/new", "routes/listings/sell-new.tsx"),
  route("sell/listings/:listingId", "routes/listings/sell-edit.tsx"),
  route("sell/listings/:listingId/photos", "routes/listings/sell-photos.ts"),
  route("sell/listings/:listingId/documents", "routes/listings/sell-documents.ts"),
  route("sell/listings/:listingId/rebuild", "routes/listings/sell-rebuild.tsx"),
  route("account/watched", "routes/listings/watched.tsx"),
  route("watched/unsubscribe", "routes/listings/watch-unsubscribe.tsx"),

  // Inspections: certified inspectors, booking and paying, dashboards
  route("inspectors", "routes/inspections/inspectors.tsx"),
  route("inspectors/:inspectorId", "routes/inspections/inspector-public.tsx"),
  route("inspectors/:inspectorId/certificate", "routes/inspections/inspector-certificate.ts"),
  route("machines/:slug/book", "routes/inspections/book.tsx"),
  route("bookings", "routes/inspections/buyer-bookings.tsx"),
  route("bookings/:bookingId", "routes/inspections/booking.tsx"),
  route("bookings/:bookingId/visit", "routes/inspections/visit.ts"),
  route("bookings/:bookingId/visit.ics", "routes/inspections/visit-calendar.ts"),
  route("bookings/:bookingId/paid", "routes/inspections/checkout-return.tsx"),
  route("bookings/:bookingId/checkout-cancelled", "routes/inspections/checkout-cancelled.tsx"),
  route("inspector/profile", "routes/inspections/inspector-profile-edit.tsx"),
  route("inspector/payouts/return", "routes/inspections/payouts-return.tsx"),
  route("inspector/payouts/refresh", "routes/inspections/payouts-refresh.tsx"),
  route("inspector/earnings", "routes/inspections/inspector-earnings.tsx"),
  route("inspector/earnings/statements/:file", "routes/inspections/inspector-statement.ts"),
  route("bookings/:bookingId/receipts/:file", "routes/inspections/receipt.ts"),
  route("inspector/bookings", "routes/inspections/inspector-bookings.tsx"),
  route("inspector/bookings/:bookingId", "routes/inspections/inspector-booking.tsx"),
  route("admin/payments", "routes/inspections/admin-payments.tsx"),

  // Accuracy reports: the inspector's entry, review and signing; public reports, certificates, verification
  route("inspector/bookings/:bookingId/rebuild", "routes/inspections/inspector-rebuild.ts"),
  route("inspector/bookings/:bookingId/report", "routes/reports/entry.tsx"),
  route("inspector/bookings/:bookingId/report/draft", "routes/reports/draft.ts"),
  route("inspector/bookings/:bookingId/report/photos", "routes/reports/setup-photos.ts"),
  route("inspector/bookings/:bookingId/report/review", "routes/reports/review.tsx"),
  route("inspector/column-mapping", "routes/reports/column-mapping.ts"),
  route("inspector/reports/:reportId/correct", "routes/reports/correct.ts"),
  route("reports/verify", "routes/reports/verify.tsx"),
  route("reports/photos/:photoId/:variant", "routes/reports/photo.ts"),
  route("reports/:reportId", "routes/reports/report.tsx"),
  route("reports/:reportId/certificate.pdf", "routes/reports/certificate.ts"),

  // Rebuilding: the correction planner
  route("tools/corrections", "routes/tools/corrections.tsx"),

  // Processed photos and documents, streamed from the bucket
  route("files/*", "routes/files.ts"),

  // API (resource routes)
  route("api/health", "routes/api.health.ts"),
  route("api/auth/*", "routes/api.auth.ts"),
  route("api/v1/evaluations", "routes/api.v1.evaluations.ts"),
  route("api/v1/listings", "routes/search/api.listings.ts"),
  route("api/v1/reports/verify", "routes/api.v1.reports.verify.ts"),
  route("api/v1/reports/:reportId", "routes/api.v1.reports.report.ts"),
  route("api/v1/reports/:reportId/credential", "routes/api.v1.reports.credential.ts"),
  route(".well-known/did.json", "routes/well-known.did.ts"),
  route("api/webhooks/stripe", "routes/api.webhooks.stripe.ts"),
] satisfies RouteConfig;

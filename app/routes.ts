import { type RouteConfig, index, route } from "@react-router/dev/routes";

// Every URL of the product, in one place.
export default [
  index("routes/home.tsx"),
  route("how-scoring-works", "routes/how-scoring-works.tsx"),

  // Processed photos and documents, streamed from the bucket
  route("files/*", "routes/files.ts"),

  // API (resource routes)
  route("api/health", "routes/api.health.ts"),
  route("api/v1/evaluations", "routes/api.v1.evaluations.ts"),
] satisfies RouteConfig;

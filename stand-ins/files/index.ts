// The local stand-in for S3: s3rver on loopback, with the bucket made at start and a CORS rule that lets
// the app's pages PUT to presigned URLs and read the objects back.
import { mkdirSync } from "node:fs";
import path from "node:path";
import S3rver from "s3rver";

export const FILES_BUCKET = "tenthmark-files";
// s3rver checks signatures against these fixed, public credentials (it runs on loopback only).
export const FILES_STAND_IN_ACCESS_KEY = "S3RVER";

function corsConfiguration(appOrigin: string) {
  const origins = new Set([appOrigin, appOrigin.replace("localhost", "127.0.0.1")]);
  return `<CORSConfiguration>
  <CORSRule>
    ${[...origins].map((origin) => `<AllowedOrigin>${origin}</AllowedOrigin>`).join("\n    ")}
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;
}

export async function startFilesStandIn({ port, dataDir, appOrigin }: { port: number; dataDir: string; appOrigin: string }) {
  const directory = path.join(dataDir, "s3");
  mkdirSync(directory, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port,
    silent: true,
    directory,
    vhostBuckets: false,
    configureBuckets: [{ name: FILES_BUCKET, configs: [corsConfiguration(appOrigin)] }],
  });
  await server.run();
  return {
    name: "files",
    env: {
      S3_ENDPOINT: `http://127.0.0.1:${port}`,
      S3_REGION: "us-east-1",
      S3_BUCKET: FILES_BUCKET,
      S3_ACCESS_KEY_ID: FILES_STAND_IN_ACCESS_KEY,
      S3_SECRET_ACCESS_KEY: FILES_STAND_IN_ACCESS_KEY,
    },
    stop: () => server.close(),
  };
}

import { DeleteObjectCommand, GetObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { env } from "~/utils/env.server";

/**
 * Object storage for provenance files, through the S3 API: a real bucket in production, the local
 * s3rver fake in development and tests (scripts/fakes.ts). The database keeps the metadata; this module
 * only moves bytes.
 */
let client: S3Client | undefined;

function s3(): S3Client {
  if (client) return client;
  const e = env();
  client = new S3Client({
    region: e.S3_REGION,
    // Path-style addressing works with the local fake and with S3-compatible stores alike.
    endpoint: e.S3_ENDPOINT,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
    // Checksums only where S3 requires them: the fake does not know the newer flexible checksums, and
    // the app verifies its own SHA-256 anyway.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  return client;
}

const bucket = () => env().S3_BUCKET;

export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
  await s3().send(
    new PutObjectCommand({ Bucket: bucket(), Key: key, Body: body, ContentType: contentType, ContentLength: body.byteLength }),
  );
}

/** The object's bytes as a web stream (nothing buffered here). */
export async function getObjectStream(key: string): Promise<ReadableStream<Uint8Array>> {
  const out = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
  if (!out.Body) throw new Error(`object storage returned no body for ${key}`);
  return out.Body.transformToWebStream() as ReadableStream<Uint8Array>;
}

export async function deleteObject(key: string): Promise<void> {
  await s3().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }));
}

import { env } from "./env.server";
import { ServiceError } from "./http.server";

/**
 * Reads one file from a multipart request without ever holding more than the upload limit in memory:
 * the body is counted while it streams in, and past the limit the rest is drained and dropped, then the
 * request is refused with 413 (draining lets the client read the answer instead of a reset connection).
 */
export type UploadedFile = { name: string; type: string; bytes: Uint8Array };

/** Room for the multipart envelope (boundaries, part headers) around the file itself. */
const ENVELOPE_BYTES = 64 * 1024;

export function uploadLimitBytes(): number {
  return env().UPLOAD_LIMIT_BYTES;
}

function tooLarge(limit: number): ServiceError {
  return new ServiceError(
    413,
    "too_large",
    `The file is larger than the upload limit of ${formatBytes(limit)}`,
    [{ field: "file", message: `At most ${limit} bytes` }],
    { limitBytes: limit },
  );
}

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${(n / (1024 * 1024)).toFixed(n % (1024 * 1024) === 0 ? 0 : 1)} MB`;
  if (n >= 1024) return `${(n / 1024).toFixed(1)} kB`;
  return `${n} bytes`;
}

export async function readUploadedFile(request: Request, field = "file"): Promise<UploadedFile> {
  const limit = uploadLimitBytes();
  const contentType = request.headers.get("Content-Type") ?? "";
  if (!/^multipart\/form-data/i.test(contentType)) {
    throw new ServiceError(400, "bad_upload", `Send the file as multipart/form-data in the field "${field}"`, [
      { field, message: "Expected a multipart/form-data body" },
    ]);
  }
  const max = limit + ENVELOPE_BYTES;
  const chunks: Uint8Array[] = [];
  let total = 0;
  let over = false;
  if (request.body) {
    const reader = request.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > max) over = true;
      if (!over) chunks.push(value);
      else chunks.length = 0; // drain: keep reading, keep nothing
    }
  }
  if (over) throw tooLarge(limit);
  const body = new Uint8Array(total);
  let offset = 0;
  for (const c of chunks) {
    body.set(c, offset);
    offset += c.byteLength;
  }
  chunks.length = 0;
  let form: FormData;
  try {
    form = await new Response(body, { headers: { "Content-Type": contentType } }).formData();
  } catch {
    throw new ServiceError(400, "bad_upload", "The multipart body could not be read", [{ field, message: "Malformed multipart body" }]);
  }
  const file = form.get(field);
  if (!file || typeof file === "string") {
    throw new ServiceError(422, "invalid_input", `No file in the field "${field}"`, [{ field, message: "Choose a file" }]);
  }
  if (file.size > limit) throw tooLarge(limit);
  if (file.size === 0) throw new ServiceError(422, "invalid_input", "The file is empty", [{ field, message: "The file is empty" }]);
  return {
    name: (file.name || "upload").slice(0, 255),
    type: file.type || "application/octet-stream",
    bytes: new Uint8Array(await file.arrayBuffer()),
  };
}

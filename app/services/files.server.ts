import { createHash, randomUUID } from "node:crypto";
import { db } from "../../db";
import type { StoredFile } from "../../db/models/files";
import { recordChange, type Principal } from "./history.server";
import { deleteObject, getObjectStream, putObject } from "./storage.server";
import { ServiceError } from "~/utils/http.server";
import type { UploadedFile } from "~/utils/upload.server";

/**
 * Provenance files: any file (a program's output, an input deck, a log) kept untouched beside a
 * calculation, with its size and SHA-256. Never parsed. The bytes go to object storage first; the
 * metadata row and its history are written in one transaction afterwards, and the object is removed
 * again if that transaction fails, so nothing is left half-stored.
 */
export type FileView = {
  id: number;
  calculationId: number | null;
  name: string;
  contentType: string;
  sizeBytes: number;
  sha256: string;
  uploadedBy: number | null;
  createdAt: string;
  downloadUrl: string;
};

export function describeFile(f: StoredFile): FileView {
  return {
    id: f.id,
    calculationId: f.calculationId ?? null,
    name: f.originalName,
    contentType: f.contentType,
    sizeBytes: Number(f.sizeBytes),
    sha256: f.sha256,
    uploadedBy: f.uploadedBy ?? null,
    createdAt: f.createdAt.toISOString(),
    downloadUrl: `/api/v1/projects/${f.projectId}/files/${f.id}`,
  };
}

export const sha256Hex = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

async function requireCalculation(projectId: number, calculationId: number) {
  const calc = await db().models.Calculation.findOne({ where: { id: calculationId, projectId }, attributes: ["id"] });
  if (!calc) throw new ServiceError(404, "not_found", "No such calculation in this project");
  return calc;
}

export async function attachFile(
  projectId: number,
  calculationId: number,
  by: Principal,
  file: UploadedFile,
): Promise<FileView> {
  await requireCalculation(projectId, calculationId);
  const sha256 = sha256Hex(file.bytes);
  const storageKey = `projects/${projectId}/files/${randomUUID()}`;
  await putObject(storageKey, file.bytes, file.type);
  const { sequelize, models } = db();
  try {
    const row = await sequelize.transaction(async (tx) => {
      const created = await models.StoredFile.create(
        {
          projectId,
          calculationId,
          originalName: file.name,
          contentType: file.type,
          sizeBytes: file.bytes.byteLength,
          sha256,
          storageKey,
          uploadedBy: by.userId,
        },
        { transaction: tx },
      );
      await recordChange(tx, by, {
        projectId,
        action: "create",
        objectType: "file",
        objectId: created.id,
        summary: `Attached ${file.name} (${file.bytes.byteLength} bytes) to calculation #${calculationId}`,
        newValues: { calculationId, name: file.name, sizeBytes: file.bytes.byteLength, sha256 },
      });
      return created;
    });
    return describeFile(row);
  } catch (error) {
    await deleteObject(storageKey).catch(() => undefined);
    throw error;
  }
}

export async function listFiles(projectId: number, calculationId?: number): Promise<FileView[]> {
  if (calculationId !== undefined) await requireCalculation(projectId, calculationId);
  const rows = await db().models.StoredFile.findAll({
    where: calculationId !== undefined ? { projectId, calculationId } : { projectId },
    order: [["id", "ASC"]],
  });
  return rows.map(describeFile);
}

/** Hashes a stream as it passes; `check()` after the end says whether it matched. */
function hashingStream(expected: string, onMismatch: (actual: string) => void) {
  const hash = createHash("sha256");
  return new TransformStream<Uint8Array, Uint8Array>({
    transform(chunk, controller) {
      hash.update(chunk);
      controller.enqueue(chunk);
    },
    flush(controller) {
      const actual = hash.digest("hex");
      if (actual !== expected) {
        onMismatch(actual);
        controller.error(new Error("stored file does not match its SHA-256"));
      }
    },
  });
}

async function hashOfObject(key: string): Promise<string> {
  const hash = createHash("sha256");
  const reader = (await getObjectStream(key)).getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    hash.update(value);
  }
  return hash.digest("hex");
}

/**
 * A file's bytes for download, streamed. The stored object is hashed once before the answer starts
 * (streamed, so memory stays bounded) so that a damaged object is refused with a clear 500 instead of
 * bytes; the bytes are hashed again on their way out, and a change in between aborts the stream.
 */
export async function openFileDownload(projectId: number, fileId: number): Promise<{ file: FileView; body: ReadableStream<Uint8Array> }> {
  const row = await db().models.StoredFile.findOne({ where: { id: fileId, projectId } });
  if (!row) throw new ServiceError(404, "not_found", "No such file in this project");
  const actual = await hashOfObject(row.storageKey);
  if (actual !== row.sha256) {
    console.error(`Stored file #${row.id} (${row.storageKey}) fails its SHA-256 check: recorded ${row.sha256}, stored bytes ${actual}`);
    throw new StoredFileCorrupt(row.id);
  }
  const body = (await getObjectStream(row.storageKey)).pipeThrough(
    hashingStream(row.sha256, (a) =>
      console.error(`Stored file #${row.id} changed while being sent: recorded ${row.sha256}, sent ${a}`),
    ),
  );
  return { file: describeFile(row), body };
}

/** The stored bytes no longer match the hash taken at upload: a server-side fault, never served. */
export class StoredFileCorrupt extends Error {
  constructor(readonly fileId: number) {
    super(`The stored copy of file #${fileId} does not match the SHA-256 recorded at upload; it is not served. The error has been logged.`);
    this.name = "StoredFileCorrupt";
  }
}

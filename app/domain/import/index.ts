/**
 * Import parsing, pure: bytes and a file name in, normalised rows and every problem out. No database:
 * the import service checks the rows against the project and stores them.
 */
import { parseTemplateCsv } from "./csv";
import { looksLikeQcschema, parseQcschema } from "./qcschema";
import { parseTemplateXlsx } from "./xlsx";
import { parseXyzFile } from "./xyz";
import type { ImportFormat, ParsedImport } from "./types";

export * from "./types";
export { parseTemplateCsv, detectDialect, splitCsv } from "./csv";
export { parseTemplateXlsx, templateXlsx } from "./xlsx";
export { parseQcschema, QCSCHEMA_NAMES } from "./qcschema";
export { parseXyzFile } from "./xyz";
export { TEMPLATE_COLUMNS, TEMPLATE_HEADINGS, TEMPLATE_EXAMPLE, templateCsv, headingWithUnit } from "./template";
export { readDecimal, readInteger, readNumberList } from "./numbers";

const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];

/** The format from the extension, confirmed by the content (an XLSX is a zip; JSON starts with { or [). */
export function detectFormat(fileName: string, bytes: Uint8Array): ImportFormat | null {
  const ext = /\.([a-z0-9]+)$/i.exec(fileName)?.[1]?.toLowerCase() ?? "";
  const isZip = ZIP_MAGIC.every((b, i) => bytes[i] === b);
  if (ext === "xlsx" || isZip) return isZip ? "xlsx" : null;
  if (ext === "csv" || ext === "txt") return "csv";
  if (ext === "xyz") return "xyz";
  if (ext === "json" || ext === "jsonl" || ext === "ndjson") return "qcschema";
  const head = new TextDecoder().decode(bytes.subarray(0, 4096)).replace(/^\uFEFF/, "").trimStart();
  if ((head.startsWith("{") || head.startsWith("[")) && looksLikeQcschema(head)) return "qcschema";
  if (/^\d+\s*\r?\n/.test(head)) return "xyz";
  return null;
}

export async function parseImportFile(fileName: string, bytes: Uint8Array): Promise<ParsedImport | null> {
  const format = detectFormat(fileName, bytes);
  if (!format) return null;
  if (format === "xlsx") return parseTemplateXlsx(bytes);
  if (format === "csv") return parseTemplateCsv(bytes);
  const text = new TextDecoder("utf-8").decode(bytes);
  return format === "qcschema" ? parseQcschema(text, fileName) : parseXyzFile(text, fileName);
}

/**
 * CSV reading for the import template. The separator is taken from the heading row: `,` (with a decimal
 * point) or `;` (with a decimal comma, as spreadsheets write it in many locales). A heading row with both
 * is refused by name rather than guessed. UTF-8 with or without a byte-order mark; CRLF, LF or CR line
 * ends; quoted values with "" for a quote (RFC 4180).
 */
import type { DecimalMark } from "./numbers";
import { rowsFromGrid } from "./template";
import type { ParsedImport } from "./types";

export function stripBom(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Separators outside quotes in the first line. */
function headingSeparators(text: string): { comma: number; semicolon: number; tab: number } {
  let comma = 0;
  let semicolon = 0;
  let tab = 0;
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === "\n" || ch === "\r")) break;
    else if (!quoted && ch === ",") comma++;
    else if (!quoted && ch === ";") semicolon++;
    else if (!quoted && ch === "\t") tab++;
  }
  return { comma, semicolon, tab };
}

export function detectDialect(text: string): { ok: true; separator: "," | ";"; mark: DecimalMark } | { ok: false; message: string } {
  const { comma, semicolon, tab } = headingSeparators(text);
  // Tab-separated text says nothing about its decimal mark, so it is refused rather than guessed.
  if (tab && !comma && !semicolon) {
    return { ok: false, message: "The heading row is separated by tabs; save the file as CSV (comma-separated with a decimal point, or semicolon-separated with a decimal comma)" };
  }
  if (comma && semicolon) {
    return { ok: false, message: `The heading row holds both commas (${comma}) and semicolons (${semicolon}); separate the columns with one of them only` };
  }
  return semicolon ? { ok: true, separator: ";", mark: "," } : { ok: true, separator: ",", mark: "." };
}

/** Splits CSV text into records of cells. Unterminated quotes are reported with the record they open. */
export function splitCsv(text: string, separator: string): { records: string[][]; unterminatedAt: number | null } {
  const records: string[][] = [];
  let record: string[] = [];
  let cell = "";
  let quoted = false;
  let quoteStart = 0;
  let i = 0;
  const n = text.length;
  while (i < n) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          cell += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        continue;
      }
      cell += ch;
      i++;
      continue;
    }
    if (ch === '"' && cell.trim() === "") {
      quoted = true;
      quoteStart = records.length + 1;
      cell = "";
      i++;
      continue;
    }
    if (ch === separator) {
      record.push(cell);
      cell = "";
      i++;
      continue;
    }
    if (ch === "\r" || ch === "\n") {
      record.push(cell);
      records.push(record);
      record = [];
      cell = "";
      i += ch === "\r" && text[i + 1] === "\n" ? 2 : 1;
      continue;
    }
    cell += ch;
    i++;
  }
  if (cell !== "" || record.length) {
    record.push(cell);
    records.push(record);
  }
  return { records, unterminatedAt: quoted ? quoteStart : null };
}

export function parseTemplateCsv(input: string | Uint8Array): ParsedImport {
  let text: string;
  try {
    text = typeof input === "string" ? input : new TextDecoder("utf-8", { fatal: true }).decode(input);
  } catch {
    return { format: "csv", rows: [], problems: [{ row: 1, column: "", message: "The file is not UTF-8 text; save the CSV as UTF-8" }], columns: {} };
  }
  text = stripBom(text);
  const dialect = detectDialect(text);
  if (!dialect.ok) return { format: "csv", rows: [], problems: [{ row: 1, column: "", message: dialect.message }], columns: {} };
  const { records, unterminatedAt } = splitCsv(text, dialect.separator);
  const parsed = rowsFromGrid(records, dialect.mark, "csv");
  if (unterminatedAt !== null) parsed.problems.push({ row: unterminatedAt, column: "", message: "A quoted value is never closed (a \" without its partner)" });
  return parsed;
}

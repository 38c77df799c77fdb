/**
 * XLSX reading for the import template (exceljs): the first worksheet, first row = headings. Number
 * cells are read as numbers (their shortest exact decimal form), text cells go through the same rules
 * as CSV cells with a decimal point, formulas give their cached result.
 */
import ExcelJS from "exceljs";
import { rowsFromGrid, TEMPLATE_EXAMPLE, TEMPLATE_HEADINGS, TEMPLATE_COLUMNS } from "./template";
import type { ParsedImport } from "./types";

function cellText(value: ExcelJS.CellValue): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "string") return value;
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (value instanceof Date) return value.toISOString();
  if (typeof value === "object") {
    if ("richText" in value) return value.richText.map((r) => r.text).join("");
    if ("result" in value) return cellText((value as { result?: ExcelJS.CellValue }).result ?? null);
    if ("text" in value) return String((value as { text: unknown }).text);
    if ("error" in value) return String((value as { error: unknown }).error);
  }
  return String(value);
}

export async function parseTemplateXlsx(bytes: Uint8Array): Promise<ParsedImport> {
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as unknown as ArrayBuffer);
  } catch {
    return { format: "xlsx", rows: [], problems: [{ row: 1, column: "", message: "The file is not a readable XLSX workbook" }], columns: {} };
  }
  const sheet = wb.worksheets.find((w) => w.state !== "hidden") ?? wb.worksheets[0];
  if (!sheet) return { format: "xlsx", rows: [], problems: [{ row: 1, column: "", message: "The workbook has no worksheet" }], columns: {} };
  const grid: string[][] = [];
  const width = Math.max(sheet.columnCount, 1);
  for (let r = 1; r <= sheet.rowCount; r++) {
    const row = sheet.getRow(r);
    const cells: string[] = [];
    for (let c = 1; c <= width; c++) cells.push(cellText(row.getCell(c).value));
    grid.push(cells);
  }
  // Trailing empty columns (formatting only) are not columns.
  return rowsFromGrid(grid, ".", "xlsx");
}

/** The filled template as an XLSX workbook, with a second sheet explaining each column. */
export async function templateXlsx(): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  wb.creator = "Thermotally";
  const ws = wb.addWorksheet("Calculations", { views: [{ state: "frozen", ySplit: 1 }] });
  ws.addRow([...TEMPLATE_HEADINGS]);
  ws.getRow(1).font = { bold: true };
  for (const r of TEMPLATE_EXAMPLE) {
    // Energies as numbers (a spreadsheet keeps all 15 digits of a number); the rest as typed.
    ws.addRow(r.map((v, i) => (typeof v === "string" && /energy|ZPE|correction/i.test(TEMPLATE_HEADINGS[i]!) && v !== "" ? Number(v) : v)));
  }
  TEMPLATE_HEADINGS.forEach((h, i) => {
    const col = ws.getColumn(i + 1);
    col.width = Math.max(12, h.length + 2);
    if (/energy|ZPE|correction/i.test(h)) col.numFmt = "0.0000000000";
  });
  const help = wb.addWorksheet("Columns");
  help.addRow(["Column", "What it holds"]);
  help.getRow(1).font = { bold: true };
  for (const c of TEMPLATE_COLUMNS) help.addRow([c.units ? `${c.heading} (${c.units.join(" | ")})` : c.heading, c.help]);
  help.getColumn(1).width = 44;
  help.getColumn(2).width = 100;
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

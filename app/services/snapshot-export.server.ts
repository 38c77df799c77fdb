import { Readable } from "node:stream";
import type { WorkbookData } from "../domain/export/types";
import { streamWorkbook } from "../domain/export/workbook";
import { parseUnit, type ComputeOptions } from "./ledger-compute.server";
import { acceptanceNote } from "./comments.server";
import { gatherExportData, XLSX_TYPE } from "./exports.server";
import { OWN_PROTOCOLS, readInputs, SNAPSHOT_UNITS, snapshotContentProviders, type SnapshotFull } from "./snapshots.server";
import { frozenAudit } from "./team-audit.server";

/**
 * The Supporting Information workbook of a snapshot. At sign-off the export's own gathering runs once
 * per protocol view and unit, and its tables are frozen into the snapshot; the workbook of a snapshot
 * is then built from those frozen tables only (its cover names the snapshot and its checksum).
 */
type FrozenTables = Pick<WorkbookData, "reactions" | "pathways" | "protocolName">;
type FrozenWorkbook = {
  common: Omit<WorkbookData, "project" | "exportedBy" | "exportedAt" | "state" | "unit" | "reactions" | "pathways" | "protocolName" | "findings">;
  views: Record<string, Record<string, FrozenTables>>;
};

snapshotContentProviders.push(async (project) => {
  const protocolIds = (await readInputs(project.id)).protocols.map((p) => String(p.id));
  const by = { name: "sign-off", email: "" };
  const views: FrozenWorkbook["views"] = {};
  let common: FrozenWorkbook["common"] | null = null;
  for (const key of [OWN_PROTOCOLS, ...protocolIds]) {
    views[key] = {};
    for (const unit of SNAPSHOT_UNITS) {
      const data = await gatherExportData(project, by, { unit, protocol: key === OWN_PROTOCOLS ? null : key });
      const { project: _p, exportedBy: _b, exportedAt: _a, state: _s, unit: _u, reactions, pathways, protocolName, findings: _f, ...rest } = data;
      common ??= rest;
      views[key][unit] = { reactions, pathways, protocolName };
    }
  }
  return { workbook: { common: common ?? undefined, views } satisfies Partial<FrozenWorkbook> };
});

const safeName = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "project";

/** The workbook data of a snapshot, from its frozen tables (nothing recomputed). */
export function snapshotWorkbookData(snapshot: SnapshotFull, exportedBy: string, options: ComputeOptions): WorkbookData {
  const frozen = snapshot.content.workbook as FrozenWorkbook | undefined;
  const unit = parseUnit(options.unit);
  const text = options.protocol === undefined || options.protocol === null || options.protocol === "" ? null : String(options.protocol);
  const protocol = text ? snapshot.content.inputs.protocols.find((p) => String(p.id) === text || p.name === text) : null;
  const key = protocol ? String(protocol.id) : OWN_PROTOCOLS;
  const view = frozen?.views[key]?.[unit];
  if (!frozen?.common || !view) throw new Error(`snapshot #${snapshot.id} holds no workbook tables for ${key} in ${unit}`);
  const audit = frozenAudit(snapshot.content);
  return {
    ...frozen.common,
    ...view,
    project: { id: snapshot.projectId, name: snapshot.content.project.name, description: snapshot.content.project.description ?? "" },
    exportedBy,
    exportedAt: new Date().toISOString(),
    state: { kind: "snapshot", id: snapshot.id, checksum: snapshot.checksum, takenAt: snapshot.signedAt, name: `signed off by ${snapshot.signer}` },
    unit,
    findings: (audit?.findings ?? []).map((f) => ({
      severity: f.severity,
      code: f.code,
      object: `${f.object.type} ${f.object.label}`,
      message: f.message + acceptanceNote(f.acceptance),
    })),
  };
}

export function snapshotWorkbook(snapshot: SnapshotFull, exportedBy: string, options: ComputeOptions) {
  const data = snapshotWorkbookData(snapshot, exportedBy, options);
  return {
    fileName: `${safeName(data.project.name)}-snapshot-${snapshot.id}-SI.xlsx`,
    contentType: XLSX_TYPE,
    body: Readable.toWeb(streamWorkbook(data)) as ReadableStream<Uint8Array>,
  };
}

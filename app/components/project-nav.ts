import type { ProjectAction } from "~/utils/permissions";

/** The project's pages, in the order of the work: data in, results, review, team. */
export type ProjectTab = { to: string; label: string; needs?: ProjectAction };

export const PROJECT_TABS: ProjectTab[] = [
  { to: "", label: "Overview" },
  { to: "species", label: "Species" },
  { to: "levels", label: "Levels" },
  { to: "calculations", label: "Calculations" },
  { to: "protocols", label: "Protocols" },
  { to: "reactions", label: "Reactions" },
  { to: "pathways", label: "Pathways" },
  { to: "audit", label: "Audit" },
  { to: "snapshots", label: "Sign-off" },
  { to: "import", label: "Import", needs: "edit" },
  { to: "export", label: "Export", needs: "export" },
  { to: "history", label: "History" },
  { to: "members", label: "Members" },
  { to: "settings", label: "Settings", needs: "manage" },
];

import type { ProjectAction } from "~/utils/permissions";

/** The project's pages, in the order of the work: data in, results, review, team. */
export type ProjectTab = { to: string; label: string; needs?: ProjectAction };

export const PROJECT_TABS: ProjectTab[] = [
  { to: "", label: "Overview" },
  { to: "history", label: "History" },
  { to: "members", label: "Members" },
  { to: "settings", label: "Settings", needs: "manage" },
];

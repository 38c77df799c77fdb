import type { Project } from "../../db/models/foundation";
import { listMembers } from "./projects.server";

export type OverviewCount = { key: string; label: string; value: number };

/**
 * What the overview shows. Other parts of the app contribute counts (species, reactions, audit
 * findings) by adding a provider to this list.
 */
export const overviewCountProviders: ((project: Project) => Promise<OverviewCount[]>)[] = [];

export async function projectOverview(project: Project) {
  const members = await listMembers(project.id);
  const counts: OverviewCount[] = [{ key: "members", label: "Members", value: members.length }];
  for (const provider of overviewCountProviders) counts.push(...(await provider(project)));
  return { members, counts };
}

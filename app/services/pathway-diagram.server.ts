import { profileStatesOf, renderProfileSvg } from "../components/profile-svg";
import { computePathway, type ComputeOptions } from "./ledger-compute.server";

/** The energy-profile figure of a pathway as an SVG document, optionally with a second protocol overlaid. */
export async function pathwayDiagram(projectId: number, pathwayId: number, options: ComputeOptions & { compare?: string | null; quantity?: "auto" | "G" | "E" }) {
  const main = await computePathway(projectId, pathwayId, options);
  const shown = profileStatesOf(main.states, options.quantity ?? "auto");
  let compare = null;
  if (options.compare) {
    const other = await computePathway(projectId, pathwayId, { ...options, protocol: options.compare });
    const q = shown.quantity === "ΔG" ? "G" : "E";
    compare = { name: other.protocol?.name ?? "comparison", states: profileStatesOf(other.states, q).states };
  }
  const svg = renderProfileSvg(shown.states, {
    unit: main.unit,
    quantity: shown.quantity,
    title: main.pathway.name,
    name: main.protocol?.name,
    compare,
  });
  const filename = `${main.pathway.name.replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "") || "pathway"}.svg`;
  return { svg, filename };
}

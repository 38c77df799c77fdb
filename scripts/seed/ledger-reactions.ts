import { db } from "../../db";
import { principalOf } from "../../app/utils/guards.server";
import { createPathway } from "../../app/services/pathways.server";
import { createReaction } from "../../app/services/reactions.server";
import type { DemoContext } from "./foundation";

/**
 * The demo's reactions and its catalytic cycle, over the species of ledger-data.ts (DEMO_SPECIES).
 * Each elementary step of the invented Ni(0)/phosphite hydrocyanation is a reaction with its transition
 * state; the cycle runs once around from the resting state NiL3 to NiL3 + product. What the audit finds
 * comes from the data planted there (the not-converged single point of TS-RE, the small imaginary mode of
 * Ni-alkyl, the missing single point of HNiCN-L2, which leaves the ligand-loss and alkene-binding steps
 * inconsistent; the cycle goes around HNiCN-L2, from H–Ni–CN (L3) straight to the alkene complex).
 */
export const DEMO_REACTIONS: { equation: string; transitionState?: string; notes: string }[] = [
  { equation: "NiL3 + HCN -> NiL3-HCN", notes: "HCN binds to the resting state" },
  { equation: "NiL3-HCN -> HNiCN-L3", transitionState: "TS-OA", notes: "oxidative addition of H–CN" },
  { equation: "HNiCN-L3 -> HNiCN-L2 + L", notes: "phosphite loss opens a site for the alkene" },
  { equation: "HNiCN-L2 + MeO-styrene -> HNiCN-L2-alkene", notes: "alkene binding" },
  { equation: "HNiCN-L2-alkene -> Ni-alkyl", transitionState: "TS-ins", notes: "migratory insertion into Ni–H (branched)" },
  { equation: "Ni-alkyl -> NiL2-nitrile", transitionState: "TS-RE", notes: "C–CN reductive elimination" },
  { equation: "NiL2-nitrile + L -> NiL3 + nitrile", notes: "product release, catalyst regenerated" },
  { equation: "NiL3 + L -> NiL4", notes: "off-cycle reservoir" },
  { equation: "HCN + MeO-styrene -> nitrile", notes: "overall reaction" },
];

export const DEMO_CYCLE_NAME = "Hydrocyanation cycle (branched)";
const CYCLE: { label: string; species: string[] }[] = [
  { label: "NiL3", species: ["NiL3", "HCN", "MeO-styrene"] },
  { label: "NiL3·HCN", species: ["NiL3-HCN", "MeO-styrene"] },
  { label: "TS-OA", species: ["TS-OA", "MeO-styrene"] },
  { label: "H–Ni–CN (L3)", species: ["HNiCN-L3", "MeO-styrene"] },
  { label: "alkene complex", species: ["HNiCN-L2-alkene", "L"] },
  { label: "TS-ins", species: ["TS-ins", "L"] },
  { label: "Ni alkyl", species: ["Ni-alkyl", "L"] },
  { label: "TS-RE", species: ["TS-RE", "L"] },
  { label: "product complex", species: ["NiL2-nitrile", "L"] },
  { label: "NiL3 + product", species: ["NiL3", "nitrile"] },
];

/** Adds the demo reactions and the cycle; idempotent (skips what exists), and skips steps whose species are missing. */
export async function seedLedgerReactions(context: DemoContext): Promise<void> {
  const { project, users } = context;
  const { models } = db();
  const by = principalOf(users["chemist@demo.test"]!);
  const labels = new Set((await models.Species.findAll({ where: { projectId: project.id }, attributes: ["label"] })).map((s) => s.label));
  const has = (l: string) => labels.has(l);
  const existing = new Set((await models.Reaction.findAll({ where: { projectId: project.id }, attributes: ["equation"] })).map((r) => r.equation));
  for (const r of DEMO_REACTIONS) {
    const used = r.equation.split(/\s+(?:\+|->)\s+/).concat(r.transitionState ? [r.transitionState] : []);
    if (existing.has(r.equation) || !used.every(has)) continue;
    await createReaction(project, by, { equation: r.equation, transitionState: r.transitionState ?? null, notes: r.notes });
  }
  const cycleExists = await models.Pathway.findOne({ where: { projectId: project.id, name: DEMO_CYCLE_NAME } });
  if (!cycleExists && CYCLE.every((s) => s.species.every(has))) {
    await createPathway(project, by, {
      name: DEMO_CYCLE_NAME,
      cycle: true,
      states: CYCLE.map((s) => ({ label: s.label, terms: s.species.map((species) => ({ species, coefficient: 1 })) })),
    });
  }
}

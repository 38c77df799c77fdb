// The units module alone: the engine index would pull the SMILES parser into the browser bundle.
import { convertEnergy, hartree, type EnergyUnit } from "~/domain/thermo/units";
import { formatEnergyValue } from "./number-format";

/** Energies shown to people: rounded for reading; stored and exported values keep every digit. */
export const DISPLAY_ENERGY_UNITS = ["kcal/mol", "kJ/mol", "eV", "cm-1", "hartree"] as const satisfies readonly EnergyUnit[];
export type DisplayEnergyUnit = (typeof DISPLAY_ENERGY_UNITS)[number];


export const UNIT_LABEL: Record<DisplayEnergyUnit, string> = {
  "kcal/mol": "kcal/mol",
  "kJ/mol": "kJ/mol",
  eV: "eV",
  "cm-1": "cm⁻¹",
  hartree: "hartree",
};

/** A hartree value in the chosen unit, rounded for reading. */
export function formatEnergy(valueHartree: number | null | undefined, unit: DisplayEnergyUnit): string {
  if (valueHartree === null || valueHartree === undefined || !Number.isFinite(valueHartree)) return "—";
  return formatEnergyValue(convertEnergy(hartree(valueHartree), unit).value, unit);
}

export function EnergyUnitSelect({ value, onChange, units = DISPLAY_ENERGY_UNITS }: { value: DisplayEnergyUnit; onChange: (u: DisplayEnergyUnit) => void; units?: readonly DisplayEnergyUnit[] }) {
  return (
    <label className="inline-flex items-center gap-2 text-sm">
      <span className="text-muted">Unit</span>
      <select className="input w-32" value={value} onChange={(e) => onChange(e.target.value as DisplayEnergyUnit)} aria-label="Energy unit">
        {units.map((u) => (
          <option key={u} value={u}>
            {UNIT_LABEL[u]}
          </option>
        ))}
      </select>
    </label>
  );
}

/** The ledger's fixed vocabularies (PRODUCT.md §2, §6), shared by services, API and pages. */
export const SPECIES_KINDS = ["minimum", "transition-state"] as const;
export const THERMAL_SOURCES = ["computed", "stored"] as const;
export const STANDARD_STATES = ["1 atm", "1 bar", "1 M"] as const;
export const LOW_FREQUENCY_TREATMENTS = ["none", "grimme", "truhlar"] as const;
export const CONFORMER_TREATMENTS = ["lowest", "boltzmann"] as const;

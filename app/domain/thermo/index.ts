/**
 * Thermotally thermochemistry engine: pure functions, plain data in and out (PRODUCT.md §3).
 * Conventions: docs/thermo-conventions.md.
 */
export { ThermoInputError } from "./errors";
export * from "./constants";
export {
  ENERGY_UNITS, J_PER_MOL, HDecimal, energy, hartree, kcalPerMol, kJPerMol, assertQuantity, convertEnergy, energyIn,
  addEnergies, subtractEnergies, scaleEnergy, parseEnergyUnit, convertTemperature, convertPressure,
  toHartreeDecimal, sumHartree, hartreeDifference, decimalTextToHartree,
} from "./units";
export type { EnergyUnit, Quantity, TemperatureUnit, PressureUnit, HartreeInput, HartreeTerm, HartreeDecimal } from "./units";
export {
  parseLevel, parseLevelString, parseCompositeLevel, canonicalLevelKey, canonicalCompositeKey, formatLevel,
  formatCompositeLevel, classifyBasis, classifyMethod, methodCarriesBasis, BUILT_IN_BASIS, canonicalBasisKey, canonicalDispersion, splitDispersion,
} from "./level";
export type { Level, LevelInput, CompositeLevel, Solvation, BasisClass, MethodClass } from "./level";
export { ELEMENTS, element, elementByNumber, normaliseSymbol } from "./elements";
export type { Element } from "./elements";
export {
  parseFormula, formulaFromSmiles, molarMass, electronCount, isMultiplicityPossible, assertMultiplicity, hillFormula,
} from "./formula";
export type { ElementCounts, ParsedFormula } from "./formula";
export {
  parseEquation, checkBalance, speciesEnergies, reactionDelta, barrierDelta, reactionEnergies, profileBarriers,
} from "./reaction";
export type {
  EquationTerm, ParsedEquation, BalanceTerm, BalanceResult, SpeciesEnergiesInput, SpeciesEnergies, EnergyKind,
  ReactionTerm, Delta, ReactionEnergiesInput, ReactionEnergies,
} from "./reaction";
export {
  parseXyz, atomMasses, principalMoments, principalMomentsFromMasses, symmetricEigenvalues3, isLinear, isAtom,
  validateGeometry, LINEAR_MOMENT_TOLERANCE,
} from "./geometry";
export type { Geometry, Vec3, MassModel } from "./geometry";
export {
  computeThermochemistry, harmonicEntropyR, freeRotorEntropyR, GRIMME_B_AV, GRIMME_ALPHA, DEFAULT_CUTOFF_CM1,
} from "./rrho";
export type { ThermoInput, ThermoResult, Contribution, LowFrequencyTreatment, LowFrequencyOptions } from "./rrho";
export { solutionStandardStateCorrection, resolveStandardState, gasStandardPressurePa } from "./standard-state";
export type { StandardState, GasStandardState, StandardStateCorrection, ResolvedStandardState } from "./standard-state";
export {
  thermalFrequency, eyringRate, halfLifeFirstOrder, barrierForHalfLife, equilibriumConstant, boltzmannPopulations,
  ensembleFreeEnergy,
} from "./kinetics";
export { energeticSpan } from "./energetic-span";
export type { SpanState, EnergeticSpanInput, EnergeticSpanResult } from "./energetic-span";
export { parseFrequencyList } from "./frequency-list";
export { electronicEnergyPlausibility, atomEnergyEstimateHartree } from "./plausibility";
export type { EnergyPlausibility } from "./plausibility";

import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from "sequelize";
import { id, fk, fkNull, version, stamps } from "./columns";

/**
 * The ledger's tables. Every editable row carries `version` for optimistic locking: an update names the
 * version it was based on and is refused (409) when the row has moved on.
 *
 * Absolute energies are kept twice: the exact decimal string that was entered (`...Text`, what every
 * computation reads) and a DECIMAL copy for queries and sorting.
 */
export type SpeciesKind = "minimum" | "transition-state";
export type ThermalSource = "computed" | "stored";
export type StandardState = "1 atm" | "1 bar" | "1 M";
export type LowFrequencyTreatment = "none" | "grimme" | "truhlar";
export type ConformerTreatment = "lowest" | "boltzmann";

export class Level extends Model<InferAttributes<Level>, InferCreationAttributes<Level>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  /** The engine's canonical key: aliases of one level share it (unique per project). */
  declare key: string;
  declare method: string;
  declare basis: string;
  declare dispersion: CreationOptional<string | null>;
  declare solvationModel: CreationOptional<string | null>;
  declare solvent: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Species extends Model<InferAttributes<Species>, InferCreationAttributes<Species>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare label: string;
  /** As entered, or derived from the SMILES. */
  declare formula: CreationOptional<string | null>;
  declare smiles: CreationOptional<string | null>;
  declare charge: CreationOptional<number>;
  declare multiplicity: CreationOptional<number>;
  declare kind: CreationOptional<SpeciesKind>;
  declare symmetryNumber: CreationOptional<number>;
  /** XYZ text in Å (header lines included), or null. */
  declare geometryXyz: CreationOptional<string | null>;
  /** The species' own standard-state concentration in mol/L (a solvent as reagent); null = 1 M. */
  declare concentrationMolL: CreationOptional<string | null>;
  declare notes: CreationOptional<string>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Conformer extends Model<InferAttributes<Conformer>, InferCreationAttributes<Conformer>> {
  declare id: CreationOptional<number>;
  declare speciesId: number;
  declare label: string;
  declare geometryXyz: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Calculation extends Model<InferAttributes<Calculation>, InferCreationAttributes<Calculation>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare speciesId: number;
  declare conformerId: CreationOptional<number | null>;
  declare levelId: number;
  /** Exactly as entered, in hartree (e.g. "-1234.567890123"). */
  declare electronicEnergyText: CreationOptional<string | null>;
  declare electronicEnergy: CreationOptional<string | null>;
  /** Harmonic frequencies in cm⁻¹, imaginary modes as negative numbers, as a JSON array. */
  declare frequencies: CreationOptional<number[] | null>;
  declare thermalTemperatureK: CreationOptional<string | null>;
  declare zpeHartree: CreationOptional<string | null>;
  declare enthalpyCorrectionHartree: CreationOptional<string | null>;
  declare gibbsCorrectionHartree: CreationOptional<string | null>;
  declare converged: CreationOptional<boolean>;
  declare sourceNote: CreationOptional<string>;
  declare createdBy: CreationOptional<number | null>;
  declare updatedBy: CreationOptional<number | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Protocol extends Model<InferAttributes<Protocol>, InferCreationAttributes<Protocol>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare name: string;
  declare energyLevelId: number;
  /** null: the thermal corrections come from the energy level. */
  declare thermalLevelId: CreationOptional<number | null>;
  declare thermalSource: CreationOptional<ThermalSource>;
  declare temperatureK: CreationOptional<string>;
  declare standardState: CreationOptional<StandardState>;
  declare lowFrequencyTreatment: CreationOptional<LowFrequencyTreatment>;
  declare lowFrequencyCutoffCm1: CreationOptional<string>;
  declare frequencyScale: CreationOptional<string>;
  declare conformerTreatment: CreationOptional<ConformerTreatment>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Reaction extends Model<InferAttributes<Reaction>, InferCreationAttributes<Reaction>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  /** The equation as normalised from what was typed, e.g. "A + 2 B -> C". */
  declare equation: string;
  declare transitionStateId: CreationOptional<number | null>;
  /** null: the project's default protocol. */
  declare protocolId: CreationOptional<number | null>;
  declare notes: CreationOptional<string>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ReactionTerm extends Model<InferAttributes<ReactionTerm>, InferCreationAttributes<ReactionTerm>> {
  declare id: CreationOptional<number>;
  declare reactionId: number;
  declare speciesId: number;
  declare side: "reactant" | "product";
  declare coefficient: string;
  declare position: number;
}

export class Pathway extends Model<InferAttributes<Pathway>, InferCreationAttributes<Pathway>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare name: string;
  declare cycle: CreationOptional<boolean>;
  declare protocolId: CreationOptional<number | null>;
  /** Index into the ordered states of the state the profile is drawn against (0 = the first). */
  declare referenceState: CreationOptional<number>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PathwayState extends Model<InferAttributes<PathwayState>, InferCreationAttributes<PathwayState>> {
  declare id: CreationOptional<number>;
  declare pathwayId: number;
  declare position: number;
  declare label: string;
}

export class PathwayStateTerm extends Model<InferAttributes<PathwayStateTerm>, InferCreationAttributes<PathwayStateTerm>> {
  declare id: CreationOptional<number>;
  declare stateId: number;
  declare speciesId: number;
  declare coefficient: string;
  declare position: number;
}

export function initLedgerModels(sequelize: Sequelize) {
  Level.init(
    {
      id: id(),
      projectId: fk(),
      key: { type: DataTypes.STRING(300), allowNull: false },
      method: { type: DataTypes.STRING(120), allowNull: false },
      basis: { type: DataTypes.STRING(120), allowNull: false },
      dispersion: { type: DataTypes.STRING(40), allowNull: true },
      solvationModel: { type: DataTypes.STRING(40), allowNull: true },
      solvent: { type: DataTypes.STRING(80), allowNull: true },
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "levels" },
  );
  Species.init(
    {
      id: id(),
      projectId: fk(),
      label: { type: DataTypes.STRING(80), allowNull: false },
      formula: { type: DataTypes.STRING(200), allowNull: true },
      smiles: { type: DataTypes.STRING(1000), allowNull: true },
      charge: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      multiplicity: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      kind: { type: DataTypes.ENUM("minimum", "transition-state"), allowNull: false, defaultValue: "minimum" },
      symmetryNumber: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      geometryXyz: { type: DataTypes.TEXT("medium"), allowNull: true },
      concentrationMolL: { type: DataTypes.DECIMAL(12, 6), allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "species" },
  );
  Conformer.init(
    {
      id: id(),
      speciesId: fk(),
      label: { type: DataTypes.STRING(80), allowNull: false },
      geometryXyz: { type: DataTypes.TEXT("medium"), allowNull: true },
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "conformers" },
  );
  Calculation.init(
    {
      id: id(),
      projectId: fk(),
      speciesId: fk(),
      conformerId: fkNull(),
      levelId: fk(),
      electronicEnergyText: { type: DataTypes.STRING(40), allowNull: true },
      electronicEnergy: { type: DataTypes.DECIMAL(24, 12), allowNull: true },
      frequencies: { type: DataTypes.JSON, allowNull: true },
      thermalTemperatureK: { type: DataTypes.DECIMAL(10, 4), allowNull: true },
      zpeHartree: { type: DataTypes.STRING(40), allowNull: true },
      enthalpyCorrectionHartree: { type: DataTypes.STRING(40), allowNull: true },
      gibbsCorrectionHartree: { type: DataTypes.STRING(40), allowNull: true },
      converged: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      sourceNote: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      createdBy: fkNull(),
      updatedBy: fkNull(),
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "calculations" },
  );
  Protocol.init(
    {
      id: id(),
      projectId: fk(),
      name: { type: DataTypes.STRING(120), allowNull: false },
      energyLevelId: fk(),
      thermalLevelId: fkNull(),
      thermalSource: { type: DataTypes.ENUM("computed", "stored"), allowNull: false, defaultValue: "computed" },
      temperatureK: { type: DataTypes.DECIMAL(10, 4), allowNull: false, defaultValue: "298.15" },
      standardState: { type: DataTypes.ENUM("1 atm", "1 bar", "1 M"), allowNull: false, defaultValue: "1 atm" },
      lowFrequencyTreatment: { type: DataTypes.ENUM("none", "grimme", "truhlar"), allowNull: false, defaultValue: "none" },
      lowFrequencyCutoffCm1: { type: DataTypes.DECIMAL(8, 2), allowNull: false, defaultValue: "100" },
      frequencyScale: { type: DataTypes.DECIMAL(8, 5), allowNull: false, defaultValue: "1" },
      conformerTreatment: { type: DataTypes.ENUM("lowest", "boltzmann"), allowNull: false, defaultValue: "lowest" },
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "protocols" },
  );
  Reaction.init(
    {
      id: id(),
      projectId: fk(),
      equation: { type: DataTypes.STRING(2000), allowNull: false },
      transitionStateId: fkNull(),
      protocolId: fkNull(),
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "reactions" },
  );
  ReactionTerm.init(
    {
      id: id(),
      reactionId: fk(),
      speciesId: fk(),
      side: { type: DataTypes.ENUM("reactant", "product"), allowNull: false },
      coefficient: { type: DataTypes.DECIMAL(12, 6), allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
    },
    { sequelize, tableName: "reaction_terms", timestamps: false },
  );
  Pathway.init(
    {
      id: id(),
      projectId: fk(),
      name: { type: DataTypes.STRING(160), allowNull: false },
      cycle: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      protocolId: fkNull(),
      referenceState: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      version: version(),
      ...stamps(),
    },
    { sequelize, tableName: "pathways" },
  );
  PathwayState.init(
    {
      id: id(),
      pathwayId: fk(),
      position: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.STRING(120), allowNull: false },
    },
    { sequelize, tableName: "pathway_states", timestamps: false },
  );
  PathwayStateTerm.init(
    {
      id: id(),
      stateId: fk(),
      speciesId: fk(),
      coefficient: { type: DataTypes.DECIMAL(12, 6), allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
    },
    { sequelize, tableName: "pathway_state_terms", timestamps: false },
  );

  Species.hasMany(Conformer, { foreignKey: "speciesId", as: "conformers" });
  Conformer.belongsTo(Species, { foreignKey: "speciesId", as: "species" });
  Calculation.belongsTo(Species, { foreignKey: "speciesId", as: "species" });
  Calculation.belongsTo(Level, { foreignKey: "levelId", as: "level" });
  Calculation.belongsTo(Conformer, { foreignKey: "conformerId", as: "conformer" });
  Reaction.hasMany(ReactionTerm, { foreignKey: "reactionId", as: "terms" });
  Pathway.hasMany(PathwayState, { foreignKey: "pathwayId", as: "states" });
  PathwayState.hasMany(PathwayStateTerm, { foreignKey: "stateId", as: "terms" });

  return { Level, Species, Conformer, Calculation, Protocol, Reaction, ReactionTerm, Pathway, PathwayState, PathwayStateTerm };
}

import { DataTypes, type QueryInterface } from "sequelize";
import { id, stamps, version, ref, tableOptions } from "./columns";


export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable(
    "levels",
    {
      id: id(),
      project_id: ref("projects"),
      key: { type: DataTypes.STRING(300), allowNull: false },
      method: { type: DataTypes.STRING(120), allowNull: false },
      basis: { type: DataTypes.STRING(120), allowNull: false },
      dispersion: { type: DataTypes.STRING(40), allowNull: true },
      solvation_model: { type: DataTypes.STRING(40), allowNull: true },
      solvent: { type: DataTypes.STRING(80), allowNull: true },
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("levels", ["project_id", "key"], { unique: true, name: "levels_project_key" });

  await qi.createTable(
    "species",
    {
      id: id(),
      project_id: ref("projects"),
      label: { type: DataTypes.STRING(80), allowNull: false },
      formula: { type: DataTypes.STRING(200), allowNull: true },
      smiles: { type: DataTypes.STRING(1000), allowNull: true },
      charge: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      multiplicity: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      kind: { type: DataTypes.ENUM("minimum", "transition-state"), allowNull: false, defaultValue: "minimum" },
      symmetry_number: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      geometry_xyz: { type: DataTypes.TEXT("medium"), allowNull: true },
      concentration_mol_l: { type: DataTypes.DECIMAL(12, 6), allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: false },
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  // Labels compare as typed (binary collation): "TS1" and "ts1" are different species.
  await qi.changeColumn("species", "label", {
    type: "VARCHAR(80) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin" as never,
    allowNull: false,
  });
  await qi.addIndex("species", ["project_id", "label"], { unique: true, name: "species_project_label" });

  await qi.createTable(
    "conformers",
    {
      id: id(),
      species_id: ref("species"),
      label: { type: DataTypes.STRING(80), allowNull: false },
      geometry_xyz: { type: DataTypes.TEXT("medium"), allowNull: true },
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("conformers", ["species_id", "label"], { unique: true, name: "conformers_species_label" });

  await qi.createTable(
    "calculations",
    {
      id: id(),
      project_id: ref("projects"),
      species_id: ref("species"),
      conformer_id: ref("conformers", "CASCADE", true),
      level_id: ref("levels", "RESTRICT"),
      electronic_energy_text: { type: DataTypes.STRING(40), allowNull: true },
      electronic_energy: { type: DataTypes.DECIMAL(24, 12), allowNull: true },
      frequencies: { type: DataTypes.JSON, allowNull: true },
      thermal_temperature_k: { type: DataTypes.DECIMAL(10, 4), allowNull: true },
      zpe_hartree: { type: DataTypes.STRING(40), allowNull: true },
      enthalpy_correction_hartree: { type: DataTypes.STRING(40), allowNull: true },
      gibbs_correction_hartree: { type: DataTypes.STRING(40), allowNull: true },
      converged: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      source_note: { type: DataTypes.TEXT, allowNull: false },
      created_by: ref("users", "SET NULL", true),
      updated_by: ref("users", "SET NULL", true),
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("calculations", ["project_id", "level_id"], { name: "calculations_project_level" });
  await qi.addIndex("calculations", ["species_id", "level_id"], { name: "calculations_species_level" });

  await qi.createTable(
    "protocols",
    {
      id: id(),
      project_id: ref("projects"),
      name: { type: DataTypes.STRING(120), allowNull: false },
      energy_level_id: ref("levels", "RESTRICT"),
      thermal_level_id: ref("levels", "RESTRICT", true),
      thermal_source: { type: DataTypes.ENUM("computed", "stored"), allowNull: false, defaultValue: "computed" },
      temperature_k: { type: DataTypes.DECIMAL(10, 4), allowNull: false, defaultValue: "298.15" },
      standard_state: { type: DataTypes.ENUM("1 atm", "1 bar", "1 M"), allowNull: false, defaultValue: "1 atm" },
      low_frequency_treatment: { type: DataTypes.ENUM("none", "grimme", "truhlar"), allowNull: false, defaultValue: "none" },
      low_frequency_cutoff_cm1: { type: DataTypes.DECIMAL(8, 2), allowNull: false, defaultValue: "100" },
      frequency_scale: { type: DataTypes.DECIMAL(8, 5), allowNull: false, defaultValue: "1" },
      conformer_treatment: { type: DataTypes.ENUM("lowest", "boltzmann"), allowNull: false, defaultValue: "lowest" },
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("protocols", ["project_id", "name"], { unique: true, name: "protocols_project_name" });

  await qi.createTable(
    "reactions",
    {
      id: id(),
      project_id: ref("projects"),
      equation: { type: DataTypes.STRING(2000), allowNull: false },
      transition_state_id: ref("species", "RESTRICT", true),
      protocol_id: ref("protocols", "SET NULL", true),
      notes: { type: DataTypes.TEXT, allowNull: false },
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  await qi.createTable(
    "reaction_terms",
    {
      id: id(),
      reaction_id: ref("reactions"),
      species_id: ref("species", "RESTRICT"),
      side: { type: DataTypes.ENUM("reactant", "product"), allowNull: false },
      coefficient: { type: DataTypes.DECIMAL(12, 6), allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
    },
    tableOptions,
  );

  await qi.createTable(
    "pathways",
    {
      id: id(),
      project_id: ref("projects"),
      name: { type: DataTypes.STRING(160), allowNull: false },
      cycle: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      protocol_id: ref("protocols", "SET NULL", true),
      reference_state: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      version: version(),
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("pathways", ["project_id", "name"], { unique: true, name: "pathways_project_name" });
  await qi.createTable(
    "pathway_states",
    {
      id: id(),
      pathway_id: ref("pathways"),
      position: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.STRING(120), allowNull: false },
    },
    tableOptions,
  );
  await qi.createTable(
    "pathway_state_terms",
    {
      id: id(),
      state_id: ref("pathway_states"),
      species_id: ref("species", "RESTRICT"),
      coefficient: { type: DataTypes.DECIMAL(12, 6), allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
    },
    tableOptions,
  );
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const table of [
    "pathway_state_terms",
    "pathway_states",
    "pathways",
    "reaction_terms",
    "reactions",
    "protocols",
    "calculations",
    "conformers",
    "species",
    "levels",
  ]) {
    await qi.dropTable(table);
  }
}

import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from "sequelize";

/** Metadata of a file kept untouched in object storage (provenance of a calculation, or of a project). */
export class StoredFile extends Model<InferAttributes<StoredFile>, InferCreationAttributes<StoredFile>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare calculationId: CreationOptional<number | null>;
  declare originalName: string;
  declare contentType: string;
  declare sizeBytes: number;
  /** Lower-case hex SHA-256 of the bytes as received. */
  declare sha256: string;
  /** Object key in the bucket. */
  declare storageKey: string;
  declare uploadedBy: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
}

export function initFileModels(sequelize: Sequelize) {
  StoredFile.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      projectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      calculationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      originalName: { type: DataTypes.STRING(255), allowNull: false },
      contentType: { type: DataTypes.STRING(160), allowNull: false },
      sizeBytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      storageKey: { type: DataTypes.STRING(300), allowNull: false },
      uploadedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "stored_files", updatedAt: false },
  );
  return { StoredFile };
}

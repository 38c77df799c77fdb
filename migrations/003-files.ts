import { DataTypes, type QueryInterface } from "sequelize";
import { created, id, ref, tableOptions } from "./columns";

/**
 * Provenance files: the bytes live in object storage (S3 API), this table keeps what is needed to find
 * them again and to prove they are unchanged (size and SHA-256 taken while they streamed in).
 */

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable(
    "stored_files",
    {
      id: id(),
      project_id: ref("projects"),
      calculation_id: ref("calculations", "SET NULL", true),
      original_name: { type: DataTypes.STRING(255), allowNull: false },
      content_type: { type: DataTypes.STRING(160), allowNull: false },
      size_bytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      storage_key: { type: DataTypes.STRING(300), allowNull: false, unique: true },
      uploaded_by: ref("users", "SET NULL", true),
      ...created(),
    },
    tableOptions,
  );
  await qi.addIndex("stored_files", ["project_id", "calculation_id"], { name: "stored_files_project_calculation" });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable("stored_files");
}

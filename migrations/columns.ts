import { DataTypes } from "sequelize";

/** Column shapes every migration uses: fresh objects on each call, so no definition is shared. */
export const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });

export const created = () => ({ created_at: { type: DataTypes.DATE, allowNull: false } });

export const stamps = () => ({ ...created(), updated_at: { type: DataTypes.DATE, allowNull: false } });

/** The optimistic-locking counter of editable rows. */
export const version = () => ({ type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 });

export const ref = (table: string, onDelete: "CASCADE" | "SET NULL" | "RESTRICT" = "CASCADE", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
});

export const tableOptions = { charset: "utf8mb4", collate: "utf8mb4_unicode_ci" };

import { DataTypes } from "sequelize";

/**
 * Attribute shapes the models share. Sequelize writes the column name into each attribute definition it
 * is given, so every call returns a fresh object: a shared one would map later columns onto the first.
 */
export const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true });
export const fk = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false });
export const fkNull = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
export const version = () => ({ type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 });
export const stamps = () => ({ createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE });

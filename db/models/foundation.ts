import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from "sequelize";
import { id, stamps } from "./columns";
import type { ProjectRole } from "../../app/utils/permissions";

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare passwordHash: string;
  declare siteAdmin: CreationOptional<boolean>;
  /** Bumped on password change: sessions carrying an older value are no longer accepted. */
  declare sessionVersion: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Project extends Model<InferAttributes<Project>, InferCreationAttributes<Project>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare description: CreationOptional<string>;
  declare createdBy: ForeignKey<number> | null;
  declare defaultProtocolId: CreationOptional<number | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare userId: number;
  declare role: ProjectRole;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare name: string;
  /** SHA-256 of the token; the token itself is shown once and never stored. */
  declare tokenHash: string;
  declare prefix: string;
  declare lastUsedAt: CreationOptional<Date | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class EmailMessage extends Model<InferAttributes<EmailMessage>, InferCreationAttributes<EmailMessage>> {
  declare id: CreationOptional<number>;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare status: "sent" | "failed";
  declare error: CreationOptional<string | null>;
  declare messageId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class HistoryEntry extends Model<InferAttributes<HistoryEntry>, InferCreationAttributes<HistoryEntry>> {
  declare id: CreationOptional<number>;
  declare projectId: number | null;
  declare userId: number | null;
  /** Who acted, as shown in the change log (kept even if the user is deleted). */
  declare actorLabel: string;
  declare action: "create" | "update" | "delete";
  declare objectType: string;
  declare objectId: number | null;
  declare summary: string;
  declare oldValues: CreationOptional<object | null>;
  declare newValues: CreationOptional<object | null>;
  declare createdAt: CreationOptional<Date>;
}


export function initFoundationModels(sequelize: Sequelize) {
  User.init(
    {
      id: id(),
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      passwordHash: { type: DataTypes.STRING(100), allowNull: false },
      siteAdmin: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      sessionVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      ...stamps(),
    },
    { sequelize, tableName: "users" },
  );
  Project.init(
    {
      id: id(),
      name: { type: DataTypes.STRING(160), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      defaultProtocolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      ...stamps(),
    },
    { sequelize, tableName: "projects" },
  );
  Membership.init(
    {
      id: id(),
      projectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      role: { type: DataTypes.ENUM("owner", "editor", "auditor", "viewer"), allowNull: false },
      ...stamps(),
    },
    { sequelize, tableName: "memberships" },
  );
  ApiToken.init(
    {
      id: id(),
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      prefix: { type: DataTypes.STRING(16), allowNull: false },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    { sequelize, tableName: "api_tokens" },
  );
  PasswordReset.init(
    {
      id: id(),
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    { sequelize, tableName: "password_resets" },
  );
  EmailMessage.init(
    {
      id: id(),
      toAddress: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      textBody: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.ENUM("sent", "failed"), allowNull: false },
      error: { type: DataTypes.TEXT, allowNull: true },
      messageId: { type: DataTypes.STRING(300), allowNull: true },
      ...stamps(),
    },
    { sequelize, tableName: "email_outbox" },
  );
  HistoryEntry.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      projectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      actorLabel: { type: DataTypes.STRING(300), allowNull: false },
      action: { type: DataTypes.ENUM("create", "update", "delete"), allowNull: false },
      objectType: { type: DataTypes.STRING(40), allowNull: false },
      objectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      summary: { type: DataTypes.STRING(500), allowNull: false },
      oldValues: { type: DataTypes.JSON, allowNull: true },
      newValues: { type: DataTypes.JSON, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "history", updatedAt: false },
  );

  Membership.belongsTo(User, { foreignKey: "userId", as: "user" });
  Membership.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Project.hasMany(Membership, { foreignKey: "projectId", as: "memberships" });
  User.hasMany(Membership, { foreignKey: "userId", as: "memberships" });
  HistoryEntry.belongsTo(User, { foreignKey: "userId", as: "user" });

  return { User, Project, Membership, ApiToken, PasswordReset, EmailMessage, HistoryEntry };
}

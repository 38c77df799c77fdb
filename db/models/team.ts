import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from "sequelize";
import { id, fk, fkNull, stamps } from "./columns";
import type { ProjectRole } from "../../app/utils/permissions";

/** An e-mailed, one-time, expiring offer to join a project with a role. Only the token's SHA-256 is kept. */
export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare email: string;
  declare role: ProjectRole;
  declare tokenHash: string;
  declare invitedBy: number | null;
  declare expiresAt: Date;
  declare acceptedAt: CreationOptional<Date | null>;
  declare acceptedBy: CreationOptional<number | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/**
 * A frozen, signed-off copy of a project's inputs and computed values. Written once and never updated:
 * the service offers no update or delete, and `checksum` is the SHA-256 of the canonical JSON of `content`.
 */
export class Snapshot extends Model<InferAttributes<Snapshot>, InferCreationAttributes<Snapshot>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare signedBy: number | null;
  declare signerLabel: string;
  declare signedAt: Date;
  declare statement: string;
  declare checksum: string;
  /** Canonical JSON text (LONGTEXT), exactly the bytes the checksum was taken over. */
  declare content: string;
  declare createdAt: CreationOptional<Date>;
}

/** A read-only URL for coauthors: to the live project (snapshotId null) or to one snapshot. */
export class ShareLink extends Model<InferAttributes<ShareLink>, InferCreationAttributes<ShareLink>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare snapshotId: number | null;
  declare tokenHash: string;
  declare prefix: string;
  declare label: string;
  declare createdBy: number | null;
  declare expiresAt: Date | null;
  declare revokedAt: CreationOptional<Date | null>;
  declare lastUsedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export type CommentTarget = "finding" | "reaction";

export class Comment extends Model<InferAttributes<Comment>, InferCreationAttributes<Comment>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare targetType: CommentTarget;
  declare targetKey: string;
  declare authorId: number | null;
  declare authorLabel: string;
  declare body: string;
  declare createdAt: CreationOptional<Date>;
}

/** An auditor's decision that a finding is acceptable as it stands; revocable (revokedAt set). */
export class FindingAcceptance extends Model<InferAttributes<FindingAcceptance>, InferCreationAttributes<FindingAcceptance>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare findingKey: string;
  declare acceptedBy: number | null;
  declare acceptedByLabel: string;
  declare reason: string;
  declare revokedAt: CreationOptional<Date | null>;
  declare revokedBy: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
}

// Fresh objects per attribute: Model.init writes the column name (`field`) into the definition object,
// so one object shared by two attributes would give the second the first one's column.

export function initTeamModels(sequelize: Sequelize) {
  Invitation.init(
    {
      id: id(),
      projectId: fk(),
      email: { type: DataTypes.STRING(254), allowNull: false },
      role: { type: DataTypes.ENUM("owner", "editor", "auditor", "viewer"), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      invitedBy: fkNull(),
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      acceptedAt: { type: DataTypes.DATE, allowNull: true },
      acceptedBy: fkNull(),
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    { sequelize, tableName: "invitations" },
  );
  Snapshot.init(
    {
      id: id(),
      projectId: fk(),
      signedBy: fkNull(),
      signerLabel: { type: DataTypes.STRING(300), allowNull: false },
      signedAt: { type: DataTypes.DATE, allowNull: false },
      statement: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      checksum: { type: DataTypes.CHAR(64), allowNull: false },
      content: { type: DataTypes.TEXT("long"), allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "snapshots", updatedAt: false },
  );
  ShareLink.init(
    {
      id: id(),
      projectId: fk(),
      snapshotId: fkNull(),
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      prefix: { type: DataTypes.STRING(16), allowNull: false },
      label: { type: DataTypes.STRING(160), allowNull: false },
      createdBy: fkNull(),
      expiresAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    { sequelize, tableName: "share_links" },
  );
  Comment.init(
    {
      id: id(),
      projectId: fk(),
      targetType: { type: DataTypes.ENUM("finding", "reaction"), allowNull: false },
      targetKey: { type: DataTypes.STRING(300), allowNull: false },
      authorId: fkNull(),
      authorLabel: { type: DataTypes.STRING(300), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "comments", updatedAt: false },
  );
  FindingAcceptance.init(
    {
      id: id(),
      projectId: fk(),
      findingKey: { type: DataTypes.STRING(300), allowNull: false },
      acceptedBy: fkNull(),
      acceptedByLabel: { type: DataTypes.STRING(300), allowNull: false },
      reason: { type: DataTypes.TEXT, allowNull: false },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      revokedBy: fkNull(),
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "finding_acceptances", updatedAt: false },
  );
  return { Invitation, Snapshot, ShareLink, Comment, FindingAcceptance };
}

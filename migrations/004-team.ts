import { DataTypes, type QueryInterface } from "sequelize";
import { id, created, stamps, ref, tableOptions } from "./columns";

/**
 * Team work: invitations by e-mail, signed-off snapshots, share links for coauthors, comments on
 * findings and reactions, and accepted findings.
 */

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable(
    "invitations",
    {
      id: id(),
      project_id: ref("projects"),
      email: { type: DataTypes.STRING(254), allowNull: false },
      role: { type: DataTypes.ENUM("owner", "editor", "auditor", "viewer"), allowNull: false },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      invited_by: ref("users", "SET NULL", true),
      expires_at: { type: DataTypes.DATE, allowNull: false },
      accepted_at: { type: DataTypes.DATE, allowNull: true },
      accepted_by: ref("users", "SET NULL", true),
      revoked_at: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("invitations", ["project_id", "email"], { name: "invitations_project_email" });

  await qi.createTable(
    "snapshots",
    {
      id: id(),
      project_id: ref("projects"),
      signed_by: ref("users", "SET NULL", true),
      /** Kept beside the id so the signature reads the same after the account is gone. */
      signer_label: { type: DataTypes.STRING(300), allowNull: false },
      signed_at: { type: DataTypes.DATE, allowNull: false },
      statement: { type: DataTypes.TEXT, allowNull: false },
      checksum: { type: DataTypes.CHAR(64), allowNull: false },
      content: { type: DataTypes.TEXT("long"), allowNull: false },
      ...created(),
    },
    tableOptions,
  );
  await qi.addIndex("snapshots", ["project_id", "signed_at"], { name: "snapshots_project_time" });

  await qi.createTable(
    "share_links",
    {
      id: id(),
      project_id: ref("projects"),
      snapshot_id: ref("snapshots", "CASCADE", true),
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      prefix: { type: DataTypes.STRING(16), allowNull: false },
      label: { type: DataTypes.STRING(160), allowNull: false },
      created_by: ref("users", "SET NULL", true),
      expires_at: { type: DataTypes.DATE, allowNull: true },
      revoked_at: { type: DataTypes.DATE, allowNull: true },
      last_used_at: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    tableOptions,
  );

  await qi.createTable(
    "comments",
    {
      id: id(),
      project_id: ref("projects"),
      target_type: { type: DataTypes.ENUM("finding", "reaction"), allowNull: false },
      /** A finding's key (rule code and object) or a reaction's id, as text. */
      target_key: { type: DataTypes.STRING(300), allowNull: false },
      author_id: ref("users", "SET NULL", true),
      author_label: { type: DataTypes.STRING(300), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: false },
      ...created(),
    },
    tableOptions,
  );
  await qi.addIndex("comments", ["project_id", "target_type", "target_key"], { name: "comments_target" });

  await qi.createTable(
    "finding_acceptances",
    {
      id: id(),
      project_id: ref("projects"),
      finding_key: { type: DataTypes.STRING(300), allowNull: false },
      accepted_by: ref("users", "SET NULL", true),
      accepted_by_label: { type: DataTypes.STRING(300), allowNull: false },
      reason: { type: DataTypes.TEXT, allowNull: false },
      revoked_at: { type: DataTypes.DATE, allowNull: true },
      revoked_by: ref("users", "SET NULL", true),
      ...created(),
    },
    tableOptions,
  );
  await qi.addIndex("finding_acceptances", ["project_id", "finding_key"], { name: "finding_acceptances_key" });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const table of ["finding_acceptances", "comments", "share_links", "snapshots", "invitations"]) {
    await qi.dropTable(table);
  }
}

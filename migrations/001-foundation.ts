import { DataTypes, type QueryInterface } from "sequelize";
import { id, stamps, ref, tableOptions } from "./columns";


export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable(
    "users",
    {
      id: id(),
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      password_hash: { type: DataTypes.STRING(100), allowNull: false },
      site_admin: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      session_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.createTable(
    "projects",
    {
      id: id(),
      name: { type: DataTypes.STRING(160), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false },
      created_by: ref("users", "SET NULL", true),
      default_protocol_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.createTable(
    "memberships",
    {
      id: id(),
      project_id: ref("projects"),
      user_id: ref("users"),
      role: { type: DataTypes.ENUM("owner", "editor", "auditor", "viewer"), allowNull: false },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.addIndex("memberships", ["project_id", "user_id"], { unique: true, name: "memberships_project_user" });
  await qi.createTable(
    "api_tokens",
    {
      id: id(),
      user_id: ref("users"),
      name: { type: DataTypes.STRING(120), allowNull: false },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      prefix: { type: DataTypes.STRING(16), allowNull: false },
      last_used_at: { type: DataTypes.DATE, allowNull: true },
      revoked_at: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.createTable(
    "password_resets",
    {
      id: id(),
      user_id: ref("users"),
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      expires_at: { type: DataTypes.DATE, allowNull: false },
      used_at: { type: DataTypes.DATE, allowNull: true },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.createTable(
    "email_outbox",
    {
      id: id(),
      to_address: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      text_body: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.ENUM("sent", "failed"), allowNull: false },
      error: { type: DataTypes.TEXT, allowNull: true },
      message_id: { type: DataTypes.STRING(300), allowNull: true },
      ...stamps(),
    },
    tableOptions,
  );
  await qi.createTable(
    "history",
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
      project_id: ref("projects", "CASCADE", true),
      user_id: ref("users", "SET NULL", true),
      actor_label: { type: DataTypes.STRING(300), allowNull: false },
      action: { type: DataTypes.ENUM("create", "update", "delete"), allowNull: false },
      object_type: { type: DataTypes.STRING(40), allowNull: false },
      object_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      summary: { type: DataTypes.STRING(500), allowNull: false },
      old_values: { type: DataTypes.JSON, allowNull: true },
      new_values: { type: DataTypes.JSON, allowNull: true },
      created_at: { type: DataTypes.DATE, allowNull: false },
    },
    tableOptions,
  );
  await qi.addIndex("history", ["project_id", "created_at"], { name: "history_project_time" });
  await qi.addIndex("history", ["object_type", "object_id"], { name: "history_object" });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const table of ["history", "email_outbox", "password_resets", "api_tokens", "memberships", "projects", "users"]) {
    await qi.dropTable(table);
  }
}

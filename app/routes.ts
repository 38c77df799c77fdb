import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

/** Every route, declared explicitly. Pages under the app layout require a signed-in user. */
export default [
  index("routes/home.tsx"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password/:token", "routes/reset-password.tsx"),
  route("healthz", "routes/healthz.ts"),

  layout("routes/app-layout.tsx", [
    route("projects", "routes/projects.tsx"),
    route("projects/:projectId", "routes/project-layout.tsx", { id: "project" }, [
      index("routes/project-overview.tsx"),
      route("members", "routes/project-members.tsx"),
      route("settings", "routes/project-settings.tsx"),
      route("history", "routes/project-history.tsx"),
    ]),
    route("settings/tokens", "routes/settings-tokens.tsx"),
    route("admin/outbox", "routes/admin-outbox.tsx"),
    route("admin/users", "routes/admin-users.tsx"),
    route("tools/thermo", "routes/tools-thermo.tsx"),
  ]),

  ...prefix("api/v1", [
    route("session", "routes/api/session.ts"),
    route("thermo", "routes/api/thermo.ts"),
    route("projects", "routes/api/projects.ts"),
    route("projects/:projectId", "routes/api/project.ts"),
    route("*", "routes/api/not-found.ts"),
  ]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;

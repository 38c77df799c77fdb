import type { Route } from "./+types/healthz";
import { checkHealth } from "~/services/health.server";

export async function loader(_: Route.LoaderArgs) {
  const health = await checkHealth();
  return Response.json(health, { status: health.ok ? 200 : 503, headers: { "Cache-Control": "no-store" } });
}

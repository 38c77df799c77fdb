import type { Route } from "./+types/thermo";
import { calculatorInputSchema, runCalculator } from "~/services/calculator.server";
import { requireUser } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody } from "~/utils/http.server";

/** POST /api/v1/thermo: the stateless calculator. Fields and answer: README, "Thermochemistry calculator". */
export const action = apiRoute(async ({ request }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST");
  await requireUser(request);
  const input = await parseJsonBody(request, calculatorInputSchema);
  return Response.json(runCalculator(input));
});

export const loader = apiRoute(async (_: Route.LoaderArgs) => errorResponse(405, "method_not_allowed", "Use POST with JSON"));

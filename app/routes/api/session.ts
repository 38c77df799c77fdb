import type { Route } from "./+types/session";
import { signInSchema } from "~/services/auth.server";
import { clientAddress } from "~/services/auth.server";
import { createApiToken } from "~/services/tokens.server";
import { verifyCredentials } from "~/services/users.server";
import { apiRoute, errorResponse, parseJsonBody } from "~/utils/http.server";

/** POST {email, password} → {token}: a new personal API token for a script. */
export const action = apiRoute(async ({ request }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST");
  const body = await parseJsonBody(request, signInSchema);
  const user = await verifyCredentials(body.email, body.password, clientAddress(request));
  const { token, record } = await createApiToken(user, `script session ${new Date().toISOString().slice(0, 16)}`);
  return Response.json({ token, tokenId: record.id }, { status: 201 });
});

export const loader = apiRoute(async (_: Route.LoaderArgs) => errorResponse(405, "method_not_allowed", "Use POST with {email, password}"));

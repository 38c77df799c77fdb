import type { Route } from "./+types/not-found";
import { errorResponse } from "~/utils/http.server";

const answer = (request: Request) =>
  errorResponse(404, "not_found", `No API route ${request.method} ${new URL(request.url).pathname}`);

export const loader = async ({ request }: Route.LoaderArgs) => answer(request);
export const action = async ({ request }: Route.ActionArgs) => answer(request);

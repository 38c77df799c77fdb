import type { Route } from "./+types/not-found";

/** Unknown pages answer 404; the root error boundary draws the app's own page. */
export async function loader(_: Route.LoaderArgs) {
  throw Response.json({ error: { code: "not_found", message: "There is nothing at this address." } }, { status: 404 });
}

export default function NotFound() {
  return null;
}

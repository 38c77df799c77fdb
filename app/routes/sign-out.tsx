import { redirect } from "react-router";
import type { Route } from "./+types/sign-out";
import { signOutAndRedirect } from "~/services/sessions.server";

export async function loader(_: Route.LoaderArgs) {
  throw redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  return signOutAndRedirect(request, "/sign-in");
}

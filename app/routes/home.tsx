import { Link, redirect } from "react-router";
import type { Route } from "./+types/home";
import { Wordmark } from "~/components/logo";
import { currentUser } from "~/utils/guards.server";

export async function loader({ request }: Route.LoaderArgs) {
  if (await currentUser(request)) throw redirect("/projects");
  return null;
}

export default function Home(_: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-3xl px-6 py-16">
      <Wordmark />
      <h1 className="mt-10 text-3xl font-bold leading-tight">
        Reaction thermochemistry your whole group can trust, from hartree to ΔG‡.
      </h1>
      <p className="mt-4 text-base text-muted">
        Store electronic energies, frequencies and thermal corrections per level of theory; define reactions and
        pathways; read ΔE, ΔH, ΔG, barriers, rate and equilibrium constants in the unit you choose. Thermotally refuses
        to combine numbers that do not belong together, keeps every change on record, and writes the Supporting
        Information workbook from a signed-off snapshot.
      </p>
      <div className="mt-8 flex gap-3">
        <Link to="/sign-in" className="btn-primary">
          Sign in
        </Link>
        <Link to="/sign-up" className="btn">
          Create an account
        </Link>
      </div>
    </main>
  );
}

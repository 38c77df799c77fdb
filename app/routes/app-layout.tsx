import { Form, NavLink, Outlet } from "react-router";
import type { Route } from "./+types/app-layout";
import { LogoMark } from "~/components/logo";
import { outboxAvailable } from "~/services/outbox.server";
import { requireUser } from "~/utils/guards.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return {
    user: { id: user.id, name: user.name, email: user.email, siteAdmin: user.siteAdmin },
    outbox: user.siteAdmin && outboxAvailable(),
  };
}

const navClass = ({ isActive }: { isActive: boolean }) =>
  `rounded-md px-2.5 py-1 text-sm ${isActive ? "bg-white/15 text-white" : "text-white/75 hover:text-white"}`;

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  const { user, outbox } = loaderData;
  return (
    <div className="min-h-screen">
      <header className="bg-ink text-white">
        <div className="mx-auto flex h-12 max-w-[1400px] items-center gap-4 px-4">
          <NavLink to="/projects" className="flex items-center gap-2 font-bold tracking-tight">
            <LogoMark size={24} />
            <span>Thermotally</span>
          </NavLink>
          <nav className="flex items-center gap-1" aria-label="Main">
            <NavLink to="/projects" className={navClass} end>
              Projects
            </NavLink>
            <NavLink to="/tools/thermo" className={navClass}>
              Calculator
            </NavLink>
            <NavLink to="/settings/tokens" className={navClass}>
              API tokens
            </NavLink>
            {user.siteAdmin ? (
              <NavLink to="/admin/users" className={navClass}>
                Users
              </NavLink>
            ) : null}
            {outbox ? (
              <NavLink to="/admin/outbox" className={navClass}>
                Outbox
              </NavLink>
            ) : null}
          </nav>
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="text-white/80" title={user.email}>
              {user.name}
              {user.siteAdmin ? <span className="ml-1 rounded bg-copper px-1.5 py-0.5 text-[11px]">site admin</span> : null}
            </span>
            <Form method="post" action="/sign-out">
              <button type="submit" className="rounded-md border border-white/25 px-2.5 py-1 text-white/85 hover:text-white">
                Sign out
              </button>
            </Form>
          </div>
        </div>
      </header>
      <Outlet />
    </div>
  );
}

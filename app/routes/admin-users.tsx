import type { Route } from "./+types/admin-users";
import { listUsers } from "~/services/users.server";
import { requireSiteAdmin } from "~/utils/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Users · Thermotally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireSiteAdmin(request);
  return { users: await listUsers() };
}

export default function Users({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-[1000px] px-4 py-6">
      <h1 className="mb-3 text-lg font-bold">Users</h1>
      <table className="table card">
        <thead>
          <tr>
            <th>Name</th>
            <th>E-mail</th>
            <th>Site admin</th>
            <th>Since</th>
          </tr>
        </thead>
        <tbody>
          {loaderData.users.map((u) => (
            <tr key={u.id}>
              <td>{u.name}</td>
              <td>{u.email}</td>
              <td>{u.siteAdmin ? "yes" : ""}</td>
              <td className="num">{u.createdAt.slice(0, 10)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </main>
  );
}

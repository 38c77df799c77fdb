import type { Route } from "./+types/admin-outbox";
import { listReceivedMail, outboxAvailable } from "~/services/outbox.server";
import { requireSiteAdmin } from "~/utils/guards.server";
import { notFound } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Outbox · Thermotally" }];

/** Development and tests only: what the local SMTP fake received. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireSiteAdmin(request);
  if (!outboxAvailable()) throw notFound("The outbox exists only in development and tests");
  return { messages: await listReceivedMail() };
}

export default function Outbox({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-[1000px] px-4 py-6">
      <h1 className="mb-1 text-lg font-bold">Outbox</h1>
      <p className="mb-4 text-sm text-muted">Messages the local mail server received. Only in development and tests.</p>
      {loaderData.messages.length === 0 ? <p className="card text-muted">No messages yet.</p> : null}
      <ul className="space-y-3">
        {loaderData.messages.map((m) => (
          <li key={m.id} className="card" data-testid="mail">
            <div className="flex flex-wrap gap-x-4 text-sm">
              <span className="font-medium">{m.subject}</span>
              <span className="text-muted">to {m.to.join(", ")}</span>
              <span className="num ml-auto text-muted">{m.receivedAt.replace("T", " ").slice(0, 19)}</span>
            </div>
            <pre className="mt-2 whitespace-pre-wrap break-words text-sm">{m.text}</pre>
          </li>
        ))}
      </ul>
    </main>
  );
}

import { data, Form } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/settings-tokens";
import { Field, FormError, Notice } from "~/components/forms";
import { createApiToken, listApiTokens, revokeApiToken } from "~/services/tokens.server";
import { requireUser } from "~/utils/guards.server";
import { parseForm, positiveIntId, ServiceError, serviceErrorToFields } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "API tokens · Thermotally" }];

const actionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("create"), name: z.string().trim().min(1, "Name the token (e.g. the cluster it runs on)").max(120) }),
  z.object({ intent: z.literal("revoke"), tokenId: positiveIntId }),
]);

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { tokens: await listApiTokens(user) };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const parsed = parseForm(await request.formData(), actionSchema);
  if (!parsed.ok) return data({ errors: parsed.errors, created: null }, { status: 422 });
  if (parsed.data.intent === "create") {
    const { token } = await createApiToken(user, parsed.data.name);
    return { errors: {} as Record<string, string>, created: token };
  }
  try {
    await revokeApiToken(user, parsed.data.tokenId);
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error), created: null }, { status: error.status });
    throw error;
  }
  return { errors: {} as Record<string, string>, created: null };
}

export default function Tokens({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <main className="mx-auto grid max-w-[1400px] gap-5 px-4 py-6 lg:grid-cols-[2fr_1fr]">
      <section className="card">
        <h1 className="mb-3 text-lg font-bold">Personal API tokens</h1>
        <p className="mb-3 text-sm text-muted">
          Scripts send a token as <code>Authorization: Bearer …</code>. A token acts with your permissions in every project.
        </p>
        <FormError error={errors.form ?? errors.tokenId} />
        {actionData?.created ? (
          <div className="mb-3">
            <Notice>New token — copy it now, it is not shown again:</Notice>
            <code data-testid="new-token" className="mt-2 block break-all rounded bg-paper p-2 text-sm">
              {actionData.created}
            </code>
          </div>
        ) : null}
        <table className="table">
          <thead>
            <tr>
              <th>Name</th>
              <th>Starts with</th>
              <th>Created</th>
              <th>Last used</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {loaderData.tokens.map((t) => (
              <tr key={t.id} className={t.revokedAt ? "text-muted line-through" : ""}>
                <td>{t.name}</td>
                <td>
                  <code>{t.prefix}…</code>
                </td>
                <td className="num">{t.createdAt.slice(0, 10)}</td>
                <td className="num">{t.lastUsedAt ? t.lastUsedAt.slice(0, 16).replace("T", " ") : "never"}</td>
                <td className="text-right">
                  {t.revokedAt ? (
                    "revoked"
                  ) : (
                    <Form method="post">
                      <input type="hidden" name="intent" value="revoke" />
                      <input type="hidden" name="tokenId" value={t.id} />
                      <button className="btn-danger" type="submit">
                        Revoke
                      </button>
                    </Form>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <Form method="post" className="card space-y-3 self-start" noValidate>
        <h2 className="font-bold">New token</h2>
        <input type="hidden" name="intent" value="create" />
        <Field label="Name" name="name" required error={errors.name} placeholder="e.g. cluster job script" />
        <button type="submit" className="btn-primary">
          Create token
        </button>
      </Form>
    </main>
  );
}

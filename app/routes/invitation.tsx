import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/invitation";
import { AuthShell } from "~/components/auth-shell";
import { Field, FormError } from "~/components/forms";
import { acceptInvitation, acceptInvitationWithNewAccount, lookUpInvitation, newAccountSchema } from "~/services/invitations.server";
import { signInAndRedirect } from "~/services/sessions.server";
import { currentUser } from "~/utils/guards.server";
import { parseForm, ServiceError, serviceErrorToFields } from "~/utils/http.server";
import { z } from "zod";

export const meta: Route.MetaFunction = () => [{ title: "Invitation · Thermotally" }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const [info, user] = await Promise.all([lookUpInvitation(params.token), currentUser(request)]);
  return { ...info, user: user ? { name: user.name, email: user.email } : null };
}

const intentSchema = z.object({ intent: z.enum(["accept", "create"]) });

export async function action({ request, params }: Route.ActionArgs) {
  const form = await request.formData();
  const intent = parseForm(form, intentSchema);
  if (!intent.ok) return data({ errors: { form: "Choose to accept or to create an account" } as Record<string, string> }, { status: 422 });
  try {
    if (intent.data.intent === "accept") {
      const user = await currentUser(request);
      if (!user) throw redirect(`/sign-in?next=${encodeURIComponent(`/invitations/${params.token}`)}`);
      const joined = await acceptInvitation(params.token, user);
      return redirect(`/projects/${joined.projectId}`);
    }
    const parsed = parseForm(form, newAccountSchema);
    if (!parsed.ok) return data({ errors: parsed.errors }, { status: 422 });
    const joined = await acceptInvitationWithNewAccount(params.token, parsed.data);
    return await signInAndRedirect(request, joined.user, `/projects/${joined.projectId}`);
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    throw error;
  }
}

export default function InvitationPage({ loaderData, actionData, params }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const { invitation, user } = loaderData;
  if (!invitation) {
    return (
      <AuthShell title="This invitation cannot be used">
        <p className="text-sm" data-testid="invitation-state" data-state={loaderData.state}>
          {loaderData.message}
        </p>
        <p className="mt-4 text-sm">
          <Link className="link" to={user ? "/projects" : "/sign-in"}>
            {user ? "Go to your projects" : "Sign in"}
          </Link>
        </p>
      </AuthShell>
    );
  }
  const next = `/invitations/${encodeURIComponent(params.token)}`;
  return (
    <AuthShell title={`Join “${invitation.projectName}”`}>
      <p className="mb-4 text-sm" data-testid="invitation-state" data-state="valid">
        {invitation.inviter} invites <span className="font-medium">{invitation.email}</span> as{" "}
        <span className="font-medium">{invitation.role}</span>. The link works once, until{" "}
        {invitation.expiresAt.slice(0, 10)}.
      </p>
      <FormError error={errors.form} />
      {user ? (
        <Form method="post" className="space-y-3">
          <input type="hidden" name="intent" value="accept" />
          {user.email !== invitation.email ? (
            <p className="text-xs text-muted">
              You are signed in as {user.email}, not as the invited address; accepting adds this account.
            </p>
          ) : null}
          <button type="submit" className="btn-primary w-full justify-center">
            Accept as {user.name}
          </button>
        </Form>
      ) : invitation.accountExists ? (
        <p className="text-sm">
          An account uses this e-mail.{" "}
          <Link className="link" to={`/sign-in?next=${encodeURIComponent(next)}`}>
            Sign in to accept
          </Link>
          .
        </p>
      ) : (
        <Form method="post" className="space-y-3" noValidate>
          <input type="hidden" name="intent" value="create" />
          <p className="text-xs text-muted">
            Create your account for {invitation.email}, or{" "}
            <Link className="link" to={`/sign-in?next=${encodeURIComponent(next)}`}>
              sign in
            </Link>{" "}
            with another one.
          </p>
          <Field label="Name" name="name" autoComplete="name" required error={errors.name} />
          <Field label="Password" name="password" type="password" autoComplete="new-password" required error={errors.password} hint="At least 10 characters" />
          <Field label="Password again" name="confirm" type="password" autoComplete="new-password" required error={errors.confirm} />
          <button type="submit" className="btn-primary w-full justify-center">
            Create account and join
          </button>
        </Form>
      )}
    </AuthShell>
  );
}

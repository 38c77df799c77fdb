import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/sign-in";
import { AuthShell } from "~/components/auth-shell";
import { Field, FormError } from "~/components/forms";
import { auth } from "~/services/auth.server";
import { safeNext, signInAndRedirect } from "~/services/sessions.server";
import { currentUser } from "~/utils/guards.server";
import { ServiceError, serviceErrorToFields } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Thermotally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const next = safeNext(new URL(request.url).searchParams.get("next"));
  if (await currentUser(request)) throw redirect(next);
  return { next };
}

export async function action({ request }: Route.ActionArgs) {
  const next = safeNext(new URL(request.url).searchParams.get("next"));
  try {
    const user = await auth().authenticate("password", request);
    return await signInAndRedirect(request, user, next);
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    throw error;
  }
}

export default function SignIn({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const busy = useNavigation().state !== "idle";
  return (
    <AuthShell
      title="Sign in"
      footer={
        <>
          New here? <Link className="link" to="/sign-up">Create an account</Link>
        </>
      }
    >
      <Form method="post" action={`/sign-in?next=${encodeURIComponent(loaderData.next)}`} className="space-y-3" noValidate>
        <FormError error={errors.form} />
        <Field label="E-mail" name="email" type="email" autoComplete="email" required error={errors.email} />
        <Field label="Password" name="password" type="password" autoComplete="current-password" required error={errors.password} />
        <button type="submit" className="btn-primary w-full justify-center" disabled={busy}>
          {busy ? "Signing in…" : "Sign in"}
        </button>
        <p className="text-right text-xs">
          <Link className="link" to="/forgot-password">Forgot your password?</Link>
        </p>
      </Form>
    </AuthShell>
  );
}

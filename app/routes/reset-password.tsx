import { data, Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/reset-password";
import { AuthShell } from "~/components/auth-shell";
import { Field, FormError } from "~/components/forms";
import { signInAndRedirect } from "~/services/sessions.server";
import { completePasswordReset, passwordSchema, resetStateMessage, resetTokenState } from "~/services/users.server";
import { parseForm, ServiceError, serviceErrorToFields } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Thermotally" }];

const schema = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

export async function loader({ params }: Route.LoaderArgs) {
  const state = await resetTokenState(params.token);
  return { state, message: resetStateMessage(state) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const parsed = parseForm(await request.formData(), schema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 422 });
  try {
    const user = await completePasswordReset(params.token, parsed.data.password);
    return await signInAndRedirect(request, user, "/projects");
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    throw error;
  }
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  if (loaderData.state !== "valid") {
    return (
      <AuthShell title="This link cannot be used">
        <p className="text-sm">{loaderData.message}</p>
        <p className="mt-4 text-sm">
          <Link className="link" to="/forgot-password">Ask for a new link</Link>
        </p>
      </AuthShell>
    );
  }
  return (
    <AuthShell title="Choose a new password">
      <Form method="post" className="space-y-3" noValidate>
        <FormError error={errors.form} />
        <Field label="New password" name="password" type="password" autoComplete="new-password" required error={errors.password} hint="At least 10 characters" />
        <Field label="New password again" name="confirm" type="password" autoComplete="new-password" required error={errors.confirm} />
        <button type="submit" className="btn-primary w-full justify-center">
          Save and sign in
        </button>
      </Form>
    </AuthShell>
  );
}

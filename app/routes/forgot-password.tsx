import { data, Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/forgot-password";
import { AuthShell } from "~/components/auth-shell";
import { Field, Notice } from "~/components/forms";
import { requestPasswordReset } from "~/services/users.server";
import { parseForm } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Reset your password · Thermotally" }];

const schema = z.object({ email: z.string().trim().toLowerCase().email("Enter a valid e-mail address") });

export async function action({ request }: Route.ActionArgs) {
  const parsed = parseForm(await request.formData(), schema);
  if (!parsed.ok) return data({ errors: parsed.errors, sent: false }, { status: 422 });
  await requestPasswordReset(parsed.data.email);
  return { errors: {} as Record<string, string>, sent: true };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <AuthShell title="Reset your password" footer={<Link className="link" to="/sign-in">Back to sign-in</Link>}>
      {actionData?.sent ? (
        <Notice>If an account uses that e-mail, a reset link is on its way. It works once, for one hour.</Notice>
      ) : (
        <Form method="post" className="space-y-3" noValidate>
          <p className="text-sm text-muted">We will e-mail you a link to choose a new password.</p>
          <Field label="E-mail" name="email" type="email" autoComplete="email" required error={errors.email} />
          <button type="submit" className="btn-primary w-full justify-center">
            Send the link
          </button>
        </Form>
      )}
    </AuthShell>
  );
}

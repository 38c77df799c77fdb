import { data, Form, Link, redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/sign-up";
import { AuthShell } from "~/components/auth-shell";
import { Field, FormError } from "~/components/forms";
import { signInAndRedirect } from "~/services/sessions.server";
import { createUser, passwordSchema } from "~/services/users.server";
import { currentUser } from "~/utils/guards.server";
import { parseForm, ServiceError, serviceErrorToFields } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Create an account · Thermotally" }];

const signUpSchema = z
  .object({
    name: z.string().trim().min(1, "Enter your name").max(120, "At most 120 characters"),
    email: z.string().trim().toLowerCase().email("Enter a valid e-mail address").max(254),
    password: passwordSchema,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

export async function loader({ request }: Route.LoaderArgs) {
  if (await currentUser(request)) throw redirect("/projects");
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const parsed = parseForm(await request.formData(), signUpSchema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 422 });
  try {
    const user = await createUser(parsed.data);
    return await signInAndRedirect(request, user, "/projects");
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    throw error;
  }
}

export default function SignUp({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <AuthShell
      title="Create an account"
      footer={
        <>
          Already have one? <Link className="link" to="/sign-in">Sign in</Link>
        </>
      }
    >
      <Form method="post" className="space-y-3" noValidate>
        <FormError error={errors.form} />
        <Field label="Name" name="name" autoComplete="name" required error={errors.name} />
        <Field label="E-mail" name="email" type="email" autoComplete="email" required error={errors.email} />
        <Field label="Password" name="password" type="password" autoComplete="new-password" required error={errors.password} hint="At least 10 characters" />
        <Field label="Password again" name="confirm" type="password" autoComplete="new-password" required error={errors.confirm} />
        <button type="submit" className="btn-primary w-full justify-center">
          Create account
        </button>
      </Form>
    </AuthShell>
  );
}

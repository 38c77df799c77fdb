import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import type { User } from "../../db/models/foundation";
import { ServiceError } from "../utils/http.server";
import { verifyCredentials } from "./users.server";

export const signInSchema = z.object({
  email: z.string().trim().min(1, "Enter your e-mail").email("Enter a valid e-mail address"),
  // bcrypt reads only the first 72 bytes of a password; longer ones are refused rather than cut silently.
  password: z.string().min(1, "Enter your password").max(72, "Passwords are at most 72 characters"),
});

/** The client address as our server sets it (server.js overwrites any header a client sent). */
export function clientAddress(request: Request): string {
  return request.headers.get("x-thermotally-client") ?? "unknown";
}

let authenticator: Authenticator<User> | undefined;

/** remix-auth with the form strategy; the session itself is the app's own cookie (session.server.ts). */
export function auth(): Authenticator<User> {
  if (authenticator) return authenticator;
  authenticator = new Authenticator<User>();
  authenticator.use(
    new FormStrategy(async ({ form, request }) => {
      const parsed = signInSchema.safeParse({ email: form.get("email"), password: form.get("password") });
      if (!parsed.success) {
        throw new ServiceError(
          422,
          "invalid_input",
          "Some fields are not valid",
          parsed.error.issues.map((i) => ({ field: String(i.path[0]), message: i.message })),
        );
      }
      return verifyCredentials(parsed.data.email, parsed.data.password, clientAddress(request));
    }),
    "password",
  );
  return authenticator;
}

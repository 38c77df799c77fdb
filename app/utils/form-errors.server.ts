import { z } from "zod";
import { ServiceError, serviceErrorToFields } from "./http.server";

/**
 * A page action's failure as field messages: a ServiceError keeps its status, a ZodError from a
 * service's schema is 422; anything else is thrown on (a real server error).
 */
export function formFailure(error: unknown): { status: number; errors: Record<string, string> } {
  if (error instanceof ServiceError) return { status: error.status, errors: serviceErrorToFields(error) };
  if (error instanceof z.ZodError) {
    const errors: Record<string, string> = {};
    for (const i of error.issues) errors[i.path.join(".") || "form"] ??= i.message;
    return { status: 422, errors };
  }
  throw error;
}

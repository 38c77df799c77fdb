import { z } from "zod";

/**
 * Errors that reach a user: JSON in the API's shape (PRODUCT.md §6), never a stack trace or SQL.
 * Route guards and services throw these Responses; API routes pass them through `apiRoute`.
 */
export type ErrorDetail = { field?: string; message: string; [key: string]: unknown };

export function errorResponse(
  status: number,
  code: string,
  message: string,
  details?: ErrorDetail[],
  extra?: Record<string, unknown>,
): Response {
  return Response.json(
    { error: { code, message, ...(details && details.length ? { details } : {}), ...(extra ?? {}) } },
    { status, headers: { "Cache-Control": "no-store" } },
  );
}

export const notFound = (what = "Not found") => errorResponse(404, "not_found", what);
export const forbidden = (what = "You do not have permission to do this here") =>
  errorResponse(403, "forbidden", what);
export const unauthorized = (what = "Sign in or send a valid API token") =>
  errorResponse(401, "unauthorized", what);
export const conflict = (message: string, extra?: Record<string, unknown>) =>
  errorResponse(409, "conflict", message, undefined, extra);

/** An expected failure raised by a service: turned into a 4xx answer (API) or a form message (page). */
export class ServiceError extends Error {
  constructor(
    readonly status: 400 | 403 | 404 | 405 | 409 | 413 | 422 | 429,
    readonly code: string,
    message: string,
    readonly details: ErrorDetail[] = [],
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = "ServiceError";
  }
  toResponse(): Response {
    return errorResponse(this.status, this.code, this.message, this.details, this.extra);
  }
}

export function zodDetails(error: z.ZodError): ErrorDetail[] {
  return error.issues.map((issue) => ({
    field: issue.path.length ? issue.path.join(".") : undefined,
    message: issue.message,
  }));
}

/** Reads a JSON body and validates it; 400 for malformed JSON, 422 for a body that breaks the schema. */
export async function parseJsonBody<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
  let body: unknown;
  try {
    const text = await request.text();
    body = text.length ? JSON.parse(text) : {};
  } catch {
    throw errorResponse(400, "bad_json", "The request body is not valid JSON");
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) {
    throw errorResponse(422, "invalid_input", "Some fields are not valid", zodDetails(parsed.error));
  }
  return parsed.data;
}

export function parseSearchParams<S extends z.ZodType>(url: URL | string, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(url).searchParams);
  const parsed = schema.safeParse(params);
  if (!parsed.success) {
    throw errorResponse(400, "invalid_query", "Some query parameters are not valid", zodDetails(parsed.error));
  }
  return parsed.data;
}

export function parseParams<S extends z.ZodType>(params: unknown, schema: S): z.infer<S> {
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw notFound();
  return parsed.data;
}

/** Form validation for pages: field messages to show beside the inputs, nothing thrown. */
export type FieldErrors = Record<string, string>;

export function parseForm<S extends z.ZodType>(
  form: FormData,
  schema: S,
): { ok: true; data: z.infer<S> } | { ok: false; errors: FieldErrors } {
  const values: Record<string, unknown> = {};
  for (const [key, value] of form.entries()) values[key] = typeof value === "string" ? value : value;
  const parsed = schema.safeParse(values);
  if (parsed.success) return { ok: true, data: parsed.data };
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) {
    const key = issue.path.join(".") || "form";
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}

/** Field errors from a ServiceError, for a page action to show beside the inputs. */
export function serviceErrorToFields(error: ServiceError): FieldErrors {
  const errors: FieldErrors = {};
  for (const d of error.details) errors[d.field ?? "form"] ??= d.message;
  if (!Object.keys(errors).length) errors.form = error.message;
  return errors;
}

/**
 * Wraps an API loader or action: thrown Responses pass through (redirects become 401 JSON, since the
 * API never redirects to a page), ServiceErrors become their 4xx answer, anything else a plain 500.
 */
export function apiRoute<A extends unknown[]>(handler: (...args: A) => Promise<Response>) {
  return async (...args: A): Promise<Response> => {
    try {
      return await handler(...args);
    } catch (error) {
      return apiErrorFrom(error);
    }
  };
}

export function apiErrorFrom(error: unknown): Response {
  if (error instanceof Response) {
    if (error.status >= 300 && error.status < 400) return unauthorized();
    return error;
  }
  if (error instanceof ServiceError) return error.toResponse();
  if (error instanceof z.ZodError) return errorResponse(422, "invalid_input", "Some fields are not valid", zodDetails(error));
  console.error("Unexpected API error:", error);
  return errorResponse(500, "internal", "Something went wrong on the server; the error has been logged");
}

export const positiveIntId = z.coerce.number().int().positive();

/** A download: the body with its type and a file name the browser saves it under (UTF-8 safe). */
export function attachment(body: BodyInit, fileName: string, contentType: string, headers: Record<string, string> = {}): Response {
  const ascii = fileName.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return new Response(body, {
    headers: {
      "Content-Type": contentType,
      "Content-Disposition": `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`,
      "Cache-Control": "no-store",
      ...headers,
    },
  });
}

/**
 * The browser's calls to the app's own JSON API (same origin, session cookie). Errors keep the API's
 * shape so that a page can show the message and the field details.
 */
export type ApiErrorBody = { code: string; message: string; details?: { field?: string; message: string; row?: number; column?: number }[]; current?: unknown };

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody,
  ) {
    super(body.message);
  }
}

export async function apiFetch<T = unknown>(path: string, options: { method?: string; body?: unknown } = {}): Promise<T> {
  const res = await fetch(path, {
    method: options.method ?? (options.body === undefined ? "GET" : "POST"),
    headers: options.body === undefined ? {} : { "Content-Type": "application/json" },
    body: options.body === undefined ? undefined : JSON.stringify(options.body),
    credentials: "same-origin",
  });
  if (res.status === 204) return undefined as T;
  const data = await res.json().catch(() => null);
  if (!res.ok) throw new ApiError(res.status, data?.error ?? { code: "http_error", message: `The server answered ${res.status}` });
  return data as T;
}

/** One line for a notice: the message and each detail. */
export function describeApiError(error: unknown): string {
  if (error instanceof ApiError) {
    const details = error.body.details?.map((d) => d.message).filter((m) => m !== error.body.message) ?? [];
    return [error.body.message, ...details].join(" · ");
  }
  return error instanceof Error ? error.message : String(error);
}

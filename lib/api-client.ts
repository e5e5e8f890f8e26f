/** Browser-side calls to our route handlers; errors arrive as ApiError with the field messages. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string>;
  constructor(status: number, code: string, message: string, fields?: Record<string, string>) {
    super(message);
    this.status = status;
    this.code = code;
    this.fields = fields ?? {};
  }
}

/**
 * Call a route handler: a JSON `body`, or a multipart `form` (uploads). Throws ApiError for any
 * non-2xx answer, carrying the server's code, message and field messages.
 */
export async function api<T>(path: string, init?: { method?: string; body?: unknown; form?: FormData; signal?: AbortSignal }): Promise<T> {
  const hasBody = init?.body !== undefined || init?.form !== undefined;
  const res = await fetch(path, {
    method: init?.method ?? (hasBody ? "POST" : "GET"),
    headers: init?.body !== undefined ? { "content-type": "application/json" } : undefined,
    body: init?.form ?? (init?.body !== undefined ? JSON.stringify(init.body) : undefined),
    signal: init?.signal,
    credentials: "same-origin",
  });
  const text = await res.text();
  let data: unknown = undefined;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    data = undefined;
  }
  if (!res.ok) {
    const e = (data as { error?: { code?: string; message?: string; fields?: Record<string, string> } } | undefined)?.error;
    throw new ApiError(res.status, e?.code ?? "error", e?.message ?? `The server answered ${res.status}.`, e?.fields);
  }
  return data as T;
}

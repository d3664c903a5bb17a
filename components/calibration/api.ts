// Calls Tidewell's API from the browser; a refusal becomes an ApiRefusal carrying the server's
// message and field messages, so forms can show both.
export class ApiRefusal extends Error {
  constructor(
    message: string,
    public status: number,
    public fields: Record<string, string> = {},
  ) {
    super(message);
  }
}

export async function api<T>(url: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, ...rest } = init;
  const res = await fetch(url, {
    ...rest,
    headers: json !== undefined ? { "content-type": "application/json", ...(rest.headers ?? {}) } : rest.headers,
    body: json !== undefined ? JSON.stringify(json) : rest.body,
  });
  const body = (await res.json().catch(() => null)) as { error?: { message: string; fields?: Record<string, string> } } | null;
  if (!res.ok) throw new ApiRefusal(body?.error?.message ?? `The server answered ${res.status}.`, res.status, body?.error?.fields);
  return body as T;
}

"use client";
// Calls to the incident and hold API from the browser; errors come back in the one error shape.
export class ApiCallError extends Error {
  constructor(
    message: string,
    public status: number,
    public fields?: Record<string, string>,
  ) {
    super(message);
  }
}

export async function postJson<T>(url: string, body: unknown = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  } catch {
    throw new ApiCallError("Tidewell could not be reached. Check the connection and try again.", 0);
  }
  const data = (await res.json().catch(() => ({}))) as { error?: { message: string; fields?: Record<string, string> } };
  if (!res.ok) throw new ApiCallError(data.error?.message ?? `The request failed (${res.status}).`, res.status, data.error?.fields);
  return data as T;
}

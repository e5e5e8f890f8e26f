/** Request parsing for route handlers: JSON bodies and query strings validated with zod. */
import { z } from "zod";
import { AppError, fromZod } from "./errors";

/** The JSON body validated by `schema`: 400 for a body that is not JSON, 422 naming the fields. */
export async function parseJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.output<S>> {
  let body: unknown;
  try {
    const text = await req.text();
    body = text.length ? JSON.parse(text) : {};
  } catch {
    throw new AppError("bad_request", "The request body must be valid JSON.");
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw fromZod(parsed.error);
  return parsed.data;
}

/** The query string validated by `schema` (422 naming the fields). */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.output<S> {
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw fromZod(parsed.error);
  return parsed.data;
}

/** Route params validated by `schema` (404 for a malformed id: it cannot exist). */
export function parseParams<S extends z.ZodType>(params: unknown, schema: S): z.output<S> {
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw new AppError("not_found", "That item was not found.");
  return parsed.data;
}

/** 201 Created with a JSON body. */
export function created(body: object): Response {
  return Response.json(body, { status: 201 });
}

import "server-only";
import { NextResponse } from "next/server";
import { ZodError, type ZodType, type z } from "zod";
import { AppError } from "@/lib/errors";
import { isUniqueViolation } from "./db-errors";

// The one place where errors become HTTP answers: { error: { code, message, fields? } }.

export type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };

const statusFor: Record<string, number> = {
  bad_request: 400,
  invalid: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported_type: 415,
  domain: 422,
  rate_limited: 429,
};

/** Field path → first message, in words a grower can act on. */
export function fieldsOf(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

export function errorResponse(err: unknown): NextResponse<ErrorBody> {
  if (err instanceof ZodError) {
    return NextResponse.json(
      { error: { code: "invalid", message: "Some of what was sent is not right. Check the marked fields.", fields: fieldsOf(err) } },
      { status: 400 },
    );
  }
  if (err instanceof AppError) {
    const status = err.status ?? statusFor[err.code] ?? 400;
    return NextResponse.json(
      { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } },
      { status },
    );
  }
  if (isUniqueViolation(err)) {
    // A check-then-insert raced another request (two taps, two phones): the other one was saved.
    return NextResponse.json(
      { error: { code: "conflict", message: "The same thing was just saved from somewhere else. Reload to see it; nothing needs to be sent again." } },
      { status: 409 },
    );
  }
  console.error("[rimebook] unexpected error", err);
  return NextResponse.json(
    { error: { code: "server_error", message: "Something went wrong on our side. Nothing you sent was lost; please try again." } },
    { status: 500 },
  );
}

/** Parse a JSON request body with a schema; malformed JSON is the sender's mistake (400), not ours. */
export async function readJson<S extends ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  let body: unknown;
  try {
    const text = await req.text();
    if (text.length > 5_000_000) throw new AppError("too_large", "That request is too large.", undefined, 413);
    body = text.length ? JSON.parse(text) : {};
  } catch (err) {
    if (err instanceof AppError) throw err;
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
  return schema.parse(body);
}

/** Parse URL search parameters with a schema. */
export function readQuery<S extends ZodType>(req: Request, schema: S): z.infer<S> {
  const url = new URL(req.url);
  return schema.parse(Object.fromEntries(url.searchParams.entries()));
}

type Handler<C> = (req: Request, ctx: C) => Promise<Response>;

/** Wraps a route handler so every thrown error is answered in the one JSON shape. */
export function route<C = unknown>(handler: Handler<C>): Handler<C> {
  return async (req, ctx) => {
    try {
      return await handler(req, ctx);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

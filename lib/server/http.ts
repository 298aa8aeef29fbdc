import "server-only";
import { NextResponse } from "next/server";
import { ZodError, type ZodType, type z } from "zod";
import { AppError } from "@/lib/errors";
import { brokenTextMessage, findBrokenText } from "@/lib/schemas/common";
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

/**
 * Reads a body up to `limit` bytes, whatever content-length says or leaves out: one byte more and `tooLarge`
 * is thrown without reading the rest.
 */
export async function readBodyCapped(req: Request, limit: number, tooLarge: () => AppError): Promise<Uint8Array> {
  const declared = Number(req.headers.get("content-length") ?? 0);
  if (declared > limit) throw tooLarge();
  if (!req.body) return new Uint8Array();
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    bytes.set(c, at);
    at += c.byteLength;
  }
  return bytes;
}

/** Refuses text holding a lone UTF-16 surrogate with a 400 naming the field (see findBrokenText). */
export function assertWellFormedText(value: unknown): void {
  const path = findBrokenText(value);
  if (path) throw new AppError("invalid", "Some of what was sent has a broken character in it.", { [path.length ? path.join(".") : "_"]: brokenTextMessage }, 400);
}

const MAX_JSON_BYTES = 5_000_000;

/**
 * Parse a JSON request body with a schema; malformed JSON is the sender's mistake (400), not ours.
 * `wellFormed: false` leaves the lone-surrogate check to the caller (the push refuses one mutation, not all).
 */
export async function readJson<S extends ZodType>(req: Request, schema: S, opts: { wellFormed?: boolean } = {}): Promise<z.infer<S>> {
  const bytes = await readBodyCapped(req, MAX_JSON_BYTES, () => new AppError("too_large", "That request is too large.", undefined, 413));
  let body: unknown;
  try {
    const text = new TextDecoder().decode(bytes);
    body = text.length ? JSON.parse(text) : {};
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
  if (opts.wellFormed !== false) assertWellFormedText(body);
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

// Errors that carry a grower-readable message and a stable code. Pure: used by lib/domain,
// lib/client and lib/server alike; lib/server/http.ts maps them to HTTP statuses.

export type ErrorCode =
  | "bad_request"
  | "invalid"
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "too_large"
  | "unsupported_type"
  | "rate_limited"
  | "domain";

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    readonly status?: number,
  ) {
    super(message);
    this.name = "AppError";
  }
}

/** A rule of the trade was broken (e.g. a decreasing cumulative count). Maps to 422. */
export class DomainError extends AppError {
  constructor(message: string, fields?: Record<string, string>) {
    super("domain", message, fields, 422);
    this.name = "DomainError";
  }
}

export const notFound = (what = "That record") => new AppError("not_found", `${what} was not found.`, undefined, 404);
export const forbidden = (message = "Your role on this farm does not allow that.") =>
  new AppError("forbidden", message, undefined, 403);
export const unauthenticated = (message = "Please sign in again.") =>
  new AppError("unauthenticated", message, undefined, 401);

import { describe, expect, it } from "vitest";
import { z } from "zod";
import { errorResponse, readJson, route } from "@/lib/server/http";
import { AppError, DomainError, notFound } from "@/lib/errors";

describe("error helper: one JSON shape for every failure", () => {
  const cases: Array<[string, unknown, number, string]> = [
    ["zod error", z.object({ a: z.number() }).safeParse({ a: "x" }).error, 400, "invalid"],
    ["not found", notFound("That bag"), 404, "not_found"],
    ["domain rule", new DomainError("Counts cannot go down."), 422, "domain"],
    ["too large", new AppError("too_large", "Too big"), 413, "too_large"],
    ["rate limited", new AppError("rate_limited", "Try again in 5 minutes."), 429, "rate_limited"],
    ["unexpected", new Error("boom"), 500, "server_error"],
  ];
  it.each(cases)("%s", async (_name, err, status, code) => {
    const res = errorResponse(err);
    expect(res.status).toBe(status);
    const body = await res.json();
    expect(body.error.code).toBe(code);
    expect(typeof body.error.message).toBe("string");
    expect(body.error.message).not.toMatch(/boom/); // internals never leak
  });

  it("names the failing fields of a zod error", async () => {
    const parsed = z.object({ bag: z.object({ seeds: z.number().int() }) }).safeParse({ bag: { seeds: 1.5 } });
    const body = await errorResponse(parsed.error).json();
    expect(Object.keys(body.error.fields)).toEqual(["bag.seeds"]);
  });

  it("turns malformed JSON into a 400, not a 500", async () => {
    const handler = route(async (req: Request) => {
      await readJson(req, z.object({}));
      return new Response("ok");
    });
    const res = await handler(new Request("http://x/", { method: "POST", body: "{nope" }), {});
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe("bad_request");
  });
});

import { describe, expect, it } from "vitest";
import { safeNext } from "@/components/auth/next-path";

// Issue 11, item 3: where sign-in sends a person next. Only a path that, parsed the browser's way
// (WHATWG URL: tabs and newlines dropped, "\" read as "/"), stays on our origin and starts with exactly one
// "/"; anything else goes to Today. `next` arrives already percent-decoded once (searchParams), so the
// encoded rows are what `?next=%2F%2F…` and the like turn into.
const origin = "http://localhost:3999";

describe("safeNext", () => {
  it.each([
    ["/bags/1", "/bags/1"],
    ["/bags/view?id=12#checks", "/bags/view?id=12#checks"],
    ["/stores", "/stores"],
    ["/%2F/evil.example", "/%2F/evil.example"], // still a path here: the encoded slash is not a slash
  ])("keeps %j", (next, expected) => {
    expect(safeNext(next, origin)).toBe(expected);
  });

  it.each([
    ["tab", "/\t/evil.example/phish"],
    ["tab, probe form", "/\t/localhost:3999/phish"],
    ["newline", "/\n/evil.example/phish"],
    ["carriage return", "/\r/evil.example/phish"],
    ["CR LF header split", "/\r\nSet-Cookie: a=b"],
    ["backslash", "\\evil.example"],
    ["slash backslash", "/\\evil.example"],
    ["backslash twice", "\\\\evil.example"],
    ["protocol-relative", "//evil.example/x"],
    ["three slashes", "///evil.example"],
    ["dot segment to //", "/.//evil.example"],
    ["decoded %2F%2F", decodeURIComponent("%2F%2Fevil.example")],
    ["decoded %5C%5C", decodeURIComponent("%5C%5Cevil.example")],
    ["decoded %09", decodeURIComponent("/%09/evil.example")],
    ["decoded %0a", decodeURIComponent("/%0a/evil.example")],
    ["decoded %0d", decodeURIComponent("/%0d/evil.example")],
    ["other site", "https://evil.example"],
    ["javascript:", "javascript:alert(1)"],
    ["JavaScript: with spaces", " JavaScript:alert(1)"],
    ["data:", "data:text/html,<script>alert(1)</script>"],
    ["no slash", "today"],
    ["empty", ""],
    ["null byte", "/\0/evil.example"],
    ["undefined", undefined],
    ["null", null],
  ])("sends %s to Today", (_, next) => {
    expect(safeNext(next, origin)).toBe("/today");
  });

  it("never answers with a line break (a redirect header must not break)", () => {
    for (const c of ["\n", "\r", "\t", "\u2028"]) expect(safeNext(`/bags${c}x`, origin)).not.toMatch(/[\r\n\t\u2028]/);
  });
});

import { describe, expect, it } from "vitest";
import { screenRoutes } from "@/sw/screens";

// Which precache entries are screens whose router payload the worker keeps for offline navigation.

describe("screenRoutes", () => {
  it("keeps the app's routes and their build revision; leaves build assets, icons and the manifest out", () => {
    const { routes, revision } = screenRoutes([
      { url: "/_next/static/chunks/main-abc.js", revision: null },
      "/_next/static/css/app.css",
      { url: "/", revision: "build-7" },
      { url: "/manifest.webmanifest", revision: "build-7" },
      { url: "/today", revision: "build-7" },
      { url: "/bags/view", revision: "build-7" },
      { url: "/icons/rimebook-192.png", revision: "e3b0c442" },
    ]);
    expect(routes).toEqual(["/", "/today", "/bags/view"]);
    expect(revision).toBe("build-7");
  });
});

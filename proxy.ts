import { NextResponse, type NextRequest } from "next/server";
import { SESSION_COOKIE, verifySessionToken } from "@/lib/server/session-token";

// Sends a person who opens a farm page without a valid session cookie to the sign-in screen.
// This is only the redirect: every route handler checks the session row, farm and role itself.
// Requests that are not page navigations (the service worker precaching the app shell, which
// holds no farm data) pass, so the app still opens offline after sign-in.

export async function proxy(req: NextRequest) {
  const mode = req.headers.get("sec-fetch-mode");
  if (mode && mode !== "navigate") return NextResponse.next();
  const token = req.cookies.get(SESSION_COOKIE)?.value;
  if (token && (await verifySessionToken(token))) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = "";
  url.searchParams.set("next", req.nextUrl.pathname + req.nextUrl.search);
  return NextResponse.redirect(url);
}

export const config = {
  matcher: ["/today/:path*", "/scan/:path*", "/check/:path*", "/bags/:path*", "/lots/:path*", "/protocols/:path*", "/stores/:path*", "/plan/:path*", "/trials/:path*", "/team/:path*", "/settings/:path*", "/labels/:path*"],
};

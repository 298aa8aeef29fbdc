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

// Deny by default: every page except the public ones (landing, sign-in/up, invite, reset, the "no
// signal" page, which holds no farm data and is what a phone falls back to, the dev mailbox), the API
// (each handler answers 401 itself), framework assets and files with an extension.
export const config = {
  matcher: ["/((?!api/|_next/|sign-in|sign-up|invite/|reset|offline|dev/|.*\\.[a-z0-9]+$).+)"],
};

import { type NextRequest, NextResponse } from "next/server";
import { RETURN_TO_HEADER } from "@/lib/auth/return-to";

// Pages learn the path they were asked for, so a signed-out visitor (say, from a link in an e-mail)
// returns to it after signing in (lib/auth/session.ts requirePageUser).
export function proxy(request: NextRequest) {
  const headers = new Headers(request.headers);
  headers.set(RETURN_TO_HEADER, request.nextUrl.pathname + request.nextUrl.search);
  return NextResponse.next({ request: { headers } });
}

export const config = {
  matcher: ["/((?!api/|_next/|sw\\.js|manifest\\.webmanifest|icons/|favicon).*)"],
};

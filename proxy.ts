import { NextResponse, type NextRequest } from "next/server";
import { citationRewriteTarget } from "@/lib/http/content-negotiation";

/**
 * Runs only where the matcher below lets it: a dataset page asked for with an Accept header that
 * names a citation type. Every other request (and so every request body elsewhere) never meets a
 * proxy; the decision itself is lib/http/content-negotiation.ts.
 */
export function proxy(request: NextRequest) {
  const target = citationRewriteTarget(request.method, request.nextUrl.pathname, request.headers.get("accept"));
  return target ? NextResponse.rewrite(new URL(target, request.url)) : NextResponse.next();
}

// Matcher values must be literals (Next reads them without running this file). The Accept test is a
// coarse, any-case look for one of the citation types; the rule in lib/http decides. A request that
// carries a body (Content-Length or Transfer-Encoding) never meets the proxy, so Next never buffers one.
export const config = {
  matcher: [
    {
      source: "/datasets/:id(\\d+)",
      has: [
        {
          type: "header",
          key: "accept",
          value:
            ".*(?:[xX]-[bB][iI][bB][tT][eE][xX]|[xX]-[rR][eE][sS][eE][aA][rR][cC][hH]-[iI][nN][fF][oO]-[sS][yY][sS][tT][eE][mM][sS]|[cC][sS][lL]\\+[jJ][sS][oO][nN]|[xX]-[bB][iI][bB][lL][iI][oO][gG][rR][aA][pP][hH][yY]).*",
        },
      ],
      missing: [
        { type: "header", key: "content-length" },
        { type: "header", key: "transfer-encoding" },
      ],
    },
    {
      source: "/datasets/:id(\\d+)/:version(v\\d+)",
      has: [
        {
          type: "header",
          key: "accept",
          value:
            ".*(?:[xX]-[bB][iI][bB][tT][eE][xX]|[xX]-[rR][eE][sS][eE][aA][rR][cC][hH]-[iI][nN][fF][oO]-[sS][yY][sS][tT][eE][mM][sS]|[cC][sS][lL]\\+[jJ][sS][oO][nN]|[xX]-[bB][iI][bB][lL][iI][oO][gG][rR][aA][pP][hH][yY]).*",
        },
      ],
      missing: [
        { type: "header", key: "content-length" },
        { type: "header", key: "transfer-encoding" },
      ],
    },
  ],
};

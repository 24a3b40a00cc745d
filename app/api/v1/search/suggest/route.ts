// GET /api/v1/search/suggest?q= — species and reactions for the header search box as the reader types (published data only)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { AppError } from "@/lib/errors";
import { MAX_QUERY_LENGTH } from "@/lib/search/params";
import { suggestForText } from "@/lib/search/suggest";

export const GET = withApi(
  async ({ req }) => {
    const params = new URL(req.url).searchParams;
    const q = params.get("q") ?? "";
    for (const name of params.keys()) {
      if (name !== "q") {
        const message = `${name} is not a parameter of the suggestions; only q is`;
        throw new AppError("bad_request", message, [{ pointer: `/${name}`, parameter: name, message }]);
      }
    }
    if (params.getAll("q").length > 1 || q.length > MAX_QUERY_LENGTH) {
      const message = `q must be given once, with at most ${MAX_QUERY_LENGTH} characters`;
      throw new AppError("bad_request", message, [{ pointer: "/q", parameter: "q", message }]);
    }
    return NextResponse.json(await suggestForText({ q }));
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);

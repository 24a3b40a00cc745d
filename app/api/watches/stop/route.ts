// POST /api/watches/stop?token=… — one-click stop of one watch (RFC 8058 List-Unsubscribe-Post), from a mail's header
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { removeWatchById } from "@/lib/watches/queries";
import { readStopToken } from "@/lib/watches/token";

export const POST = withApi(
  async ({ req }) => {
    const token = new URL(req.url).searchParams.get("token") ?? "";
    const named = readStopToken(token);
    if (!named)
      throw new AppError("bad_request", "This stop link is not valid", [
        { pointer: "/token", parameter: "token", message: "not a valid stop link" },
      ]);
    const stopped = await removeWatchById(named);
    return Response.json({ stopped });
  },
  { scope: null },
);

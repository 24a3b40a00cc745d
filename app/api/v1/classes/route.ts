// GET /api/v1/classes — every reaction class with its count of public reactions and datasets
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { appUrl } from "@/lib/config";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { classPath } from "@/lib/identifiers/paths";
import { listClassCounts } from "@/lib/reactions/public-queries";

export const GET = withApi(
  async () => {
    const counts = await listClassCounts();
    return NextResponse.json({
      data: counts.map((c) => {
        const cls = REACTION_CLASSES.find((r) => r.id === c.id)!;
        return { ...c, label: cls.label, description: cls.hint, landingPage: `${appUrl()}${classPath(c.id)}` };
      }),
    });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);

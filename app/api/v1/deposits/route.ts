// GET /api/v1/deposits — the datasets the caller owns or co-edits, newest version of each (drafts included)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { listMyVersions } from "@/lib/datasets/queries";

export const GET = withApi(
  async ({ user }) => {
    const mine = await listMyVersions({ userId: user!.id });
    return NextResponse.json({
      data: mine.map((v) => ({
        datasetId: v.datasetId,
        versionId: v.id,
        number: v.number,
        title: v.title,
        state: v.state,
        role: v.role,
        lockVersion: v.lockVersion,
        versionIdentifier: v.versionIdentifier,
        problems: v.draftProblems?.length ?? 0,
        updatedAt: v.updatedAt.toISOString(),
        submittedAt: v.submittedAt?.toISOString() ?? null,
        publishedAt: v.publishedAt?.toISOString() ?? null,
        href: `/api/v1/versions/${v.id}`,
      })),
    });
  },
  { permission: "dataset.deposit", scope: "deposit:read" },
);

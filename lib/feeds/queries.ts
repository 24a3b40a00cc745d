import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import type { ReactionClassId } from "@/lib/deposits/vocabulary";
import { classOf } from "@/lib/reactions/public-queries";
import { reactionDisplayEquation } from "@/lib/reactions/display-names";
import { FEED_ENTRIES, type FeedVersion } from "./atom";

/**
 * The public versions (published or retracted, old versions too: each publication is news) of one
 * reaction or of one reaction class, newest event first. A draft, a submission or a declined
 * version never appears. Plain JSON, so the result can be cached.
 */
export async function listFeedVersions(where: { reactionId: number } | { classId: ReactionClassId }): Promise<FeedVersion[]> {
  const match = "reactionId" in where ? sql`v.reaction_id = ${where.reactionId}` : sql`${classOf(sql`v.payload`)} = ${where.classId}`;
  const rows = await getDb().execute<{
    dataset_id: number;
    number: number;
    title: string;
    equation: string | null;
    identifier: string | null;
    point_count: number;
    t_min: number | null;
    t_max: number | null;
    published_at: string;
    retracted_at: string | null;
    retraction_notice: string | null;
  }>(sql`
    select v.dataset_id, v.number, v.title, ${reactionDisplayEquation(sql`v.reaction_id`)} as equation,
      v.version_identifier as identifier, v.point_count, v.t_min, v.t_max,
      to_char(v.published_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') as published_at,
      to_char(v.retracted_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') as retracted_at,
      v.retraction_notice
    from dataset_versions v
    where v.state in ('published', 'retracted') and v.published_at is not null and v.reaction_id is not null and ${match}
    order by greatest(v.published_at, coalesce(v.retracted_at, v.published_at)) desc, v.id desc
    limit ${FEED_ENTRIES}`);
  return rows.map((r) => ({
    datasetId: Number(r.dataset_id),
    number: Number(r.number),
    title: r.title,
    equation: r.equation ?? "",
    identifier: r.identifier,
    pointCount: Number(r.point_count),
    tMin: r.t_min === null ? null : Number(r.t_min),
    tMax: r.t_max === null ? null : Number(r.t_max),
    publishedAt: r.published_at,
    retractedAt: r.retracted_at,
    retractionNotice: r.retraction_notice,
  }));
}

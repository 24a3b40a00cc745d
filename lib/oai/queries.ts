import "server-only";
import { getVerifiedCreatorIds } from "@/lib/people/queries";
import { and, asc, eq, inArray, isNotNull, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, datasetVersions } from "@/db/datasets";
import type { VersionState } from "@/lib/curation/lifecycle";
import type { RegistrationSubject } from "@/lib/identifiers/queries";
import { classOf } from "@/lib/reactions/public-queries";

/**
 * What OAI-PMH harvests: every public version (published, or retracted — then a deleted record),
 * never a draft, a submission, a returned or a declined one. A record's datestamp is when its
 * record last changed (oai_record_datestamps, kept by the trigger of drizzle/0028: its publication,
 * the publication of the version just before or after it, its retraction); lists run in
 * (datestamp, id) order and page by keyset on that table's index.
 */

const DATESTAMP = sql`r.changed_at`;
/** Every public version, with its datestamp as `r`. */
const RECORDS = sql`dataset_versions v join oai_record_datestamps r on r.version_id = v.id`;
const PUBLIC = sql`v.state in ('published', 'retracted') and v.version_identifier is not null`;

export interface OaiHeaderRow {
  versionId: number;
  /** The version identifier (the OAI identifier's local part). */
  identifier: string;
  datestamp: Date;
  /** The exact datestamp (microseconds), for the next page's keyset. */
  position: string;
  deleted: boolean;
  /** The reaction class (current id) the version's document names, if any. */
  setSpec: string | null;
}

export interface OaiListFilter {
  /** First instant admitted. */
  from: Date | null;
  /** First instant no longer admitted. */
  until: Date | null;
  set: string | null;
}

function filterSql({ from, until, set }: OaiListFilter): SQL {
  const parts = [PUBLIC];
  if (from) parts.push(sql`${DATESTAMP} >= ${from.toISOString()}::timestamptz`);
  if (until) parts.push(sql`${DATESTAMP} < ${until.toISOString()}::timestamptz`);
  if (set !== null) parts.push(sql`${classOf(sql`v.payload`)} = ${set}`);
  return sql.join(parts, sql` and `);
}

type HeaderSqlRow = { id: number; identifier: string; datestamp: Date | string; position: string; state: string; set_spec: string | null };

const HEADER_COLUMNS = sql`v.id, v.version_identifier as identifier, ${DATESTAMP} as datestamp,
  to_char(${DATESTAMP} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') as position, v.state::text as state,
  ${classOf(sql`v.payload`)} as set_spec`;

const toHeader = (r: HeaderSqlRow): OaiHeaderRow => ({
  versionId: Number(r.id),
  identifier: r.identifier,
  datestamp: new Date(r.datestamp),
  position: r.position,
  deleted: r.state === "retracted",
  setSpec: r.set_spec,
});

/** One page of headers after `after` (exclusive), oldest datestamp first. */
export async function listOaiHeaders({
  filter,
  after,
  limit,
}: {
  filter: OaiListFilter;
  after: { at: string; id: number } | null;
  limit: number;
}): Promise<OaiHeaderRow[]> {
  const keyset = after ? sql` and (r.changed_at, r.version_id) > (${after.at}::timestamptz, ${after.id})` : sql``;
  const rows = await getDb().execute<HeaderSqlRow>(sql`
    select ${HEADER_COLUMNS} from ${RECORDS}
    where ${filterSql(filter)}${keyset}
    order by r.changed_at, r.version_id limit ${limit}`);
  return rows.map(toHeader);
}

/** How many records the whole list holds (§3.5.1 completeListSize). */
export async function countOaiHeaders({ filter }: { filter: OaiListFilter }): Promise<number> {
  const [row] = await getDb().execute<{ n: number }>(sql`select count(*)::int as n from ${RECORDS} where ${filterSql(filter)}`);
  return Number(row?.n ?? 0);
}

/** The header of one public version by its version identifier, or null (unknown, or not public). */
export async function getOaiHeader({ identifier }: { identifier: string }): Promise<OaiHeaderRow | null> {
  const [row] = await getDb().execute<HeaderSqlRow>(sql`
    select ${HEADER_COLUMNS} from ${RECORDS} where ${PUBLIC} and v.version_identifier = ${identifier}`);
  return row ? toHeader(row) : null;
}

/** The oldest datestamp of any record (Identify's earliestDatestamp), or null while none is public. */
export async function getOaiEarliestDatestamp(): Promise<Date | null> {
  const [row] = await getDb().execute<{ earliest: Date | string | null }>(sql`
    select min(${DATESTAMP}) as earliest from ${RECORDS} where ${PUBLIC}`);
  return row?.earliest ? new Date(row.earliest) : null;
}

/**
 * What the DataCite builder needs of each listed version (lib/identifiers/register.ts
 * buildRegistrationBody), read for a whole page in two queries: the versions, and every version
 * with an identifier of their datasets (for the version relations).
 */
export async function listOaiRecordSubjects({ versionIds }: { versionIds: number[] }): Promise<Map<number, RegistrationSubject>> {
  const subjects = new Map<number, RegistrationSubject>();
  if (!versionIds.length) return subjects;
  const db = getDb();
  const described = await db
    .select({
      id: datasetVersions.id,
      datasetId: datasetVersions.datasetId,
      number: datasetVersions.number,
      title: datasetVersions.title,
      payload: datasetVersions.payload,
      publishedAt: datasetVersions.publishedAt,
      state: datasetVersions.state,
      retractedAt: datasetVersions.retractedAt,
      retractionNotice: datasetVersions.retractionNotice,
      versionIdentifier: datasetVersions.versionIdentifier,
      seriesIdentifier: datasets.seriesIdentifier,
    })
    .from(datasetVersions)
    .innerJoin(datasets, eq(datasets.id, datasetVersions.datasetId))
    .where(and(inArray(datasetVersions.id, versionIds), isNotNull(datasetVersions.versionIdentifier)));
  const datasetIds = [...new Set(described.map((d) => d.datasetId))];
  const siblings = datasetIds.length
    ? await db
        .select({
          id: datasetVersions.id,
          datasetId: datasetVersions.datasetId,
          number: datasetVersions.number,
          versionIdentifier: datasetVersions.versionIdentifier,
          state: datasetVersions.state,
          publishedAt: datasetVersions.publishedAt,
        })
        .from(datasetVersions)
        .where(and(inArray(datasetVersions.datasetId, datasetIds), isNotNull(datasetVersions.versionIdentifier)))
        .orderBy(asc(datasetVersions.datasetId), asc(datasetVersions.number))
    : [];
  const verified = await getVerifiedCreatorIds({ versionIds: described.map((d) => d.id) });
  for (const d of described) {
    subjects.set(d.id, {
      identifier: d.versionIdentifier!,
      kind: "version",
      datasetId: d.datasetId,
      registered: false,
      attempts: 0,
      seriesIdentifier: d.seriesIdentifier,
      described: {
        id: d.id,
        number: d.number,
        title: d.title,
        payload: d.payload,
        publishedAt: d.publishedAt,
        state: d.state as VersionState,
        retractedAt: d.retractedAt,
        retractionNotice: d.retractionNotice,
        verifiedCreatorIds: verified.get(d.id),
      },
      versions: siblings
        .filter((s) => s.datasetId === d.datasetId)
        .map((s) => ({
          id: s.id,
          number: s.number,
          versionIdentifier: s.versionIdentifier!,
          state: s.state as VersionState,
          publishedAt: s.publishedAt,
        })),
    });
  }
  return subjects;
}

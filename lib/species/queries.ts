import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { species, speciesDrawings } from "@/db/chemistry";

/** What a species drawing is kept by: SMILES, size in px and the toolkit version that drew it. */
export interface DrawingKey {
  smiles: string;
  width: number;
  height: number;
  drawer: string;
}

/** The kept drawing, or null. */
export async function readKeptDrawing(key: DrawingKey): Promise<string | null> {
  const [kept] = await getDb()
    .select({ svg: speciesDrawings.svg })
    .from(speciesDrawings)
    .where(
      and(
        eq(speciesDrawings.smiles, key.smiles),
        eq(speciesDrawings.width, key.width),
        eq(speciesDrawings.height, key.height),
        eq(speciesDrawings.drawer, key.drawer),
      ),
    )
    .limit(1);
  return kept?.svg ?? null;
}

/** Keeps a drawing (another process may have kept the same one first: that one stays). */
export async function keepDrawing(key: DrawingKey, svg: string): Promise<void> {
  await getDb()
    .insert(speciesDrawings)
    .values({ ...key, svg })
    .onConflictDoNothing();
}

/** The SMILES of species with no kept drawing at this size by this toolkit version. */
export async function listUndrawnSmiles({ width, height, drawer }: Omit<DrawingKey, "smiles">): Promise<string[]> {
  const rows = await getDb()
    .select({ smiles: species.canonicalSmiles })
    .from(species)
    .where(
      sql`not exists (select 1 from ${speciesDrawings} d where d.smiles = ${species.canonicalSmiles}
        and d.width = ${width} and d.height = ${height} and d.drawer = ${drawer})`,
    )
    .groupBy(species.canonicalSmiles);
  return rows.map((r) => r.smiles);
}

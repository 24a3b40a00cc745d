/**
 * npm run bench:oai — what one OAI-PMH ListRecords page costs on the request thread, on the
 * project's own database (the demo seed: `npm run db:seed`). Not a test: prints one table.
 * "Cold" is the first request of the process after the citation styles are warmed (as
 * scripts/serve.ts does before it serves), so every record is built for the first time; "warm" is
 * the median of the same page asked again (BENCH_REPEAT times, default 7).
 */
import { warmCitationStyles } from "@/lib/citation/formats";
import { answerOaiRequest } from "@/lib/oai/respond";

const repeat = Number(process.env.BENCH_REPEAT ?? 7);

async function time(query: string): Promise<{ ms: number; records: number }> {
  const started = performance.now();
  const xml = await answerOaiRequest(new URLSearchParams(query));
  const ms = performance.now() - started;
  return { ms, records: (xml.match(/<record>/g) ?? []).length };
}

async function main() {
  warmCitationStyles();
  // The database connection and the modules, as a running server has them.
  await answerOaiRequest(new URLSearchParams("verb=Identify"));
  const rows: Record<string, string | number>[] = [];
  for (const prefix of ["oai_datacite", "oai_dc"]) {
    const query = `verb=ListRecords&metadataPrefix=${prefix}`;
    const cold = await time(query);
    const warm: number[] = [];
    for (let i = 0; i < repeat; i++) warm.push((await time(query)).ms);
    warm.sort((a, b) => a - b);
    const median = warm[Math.floor(warm.length / 2)];
    rows.push({
      format: prefix,
      records: cold.records,
      "cold ms": Math.round(cold.ms),
      "cold ms/record": +(cold.ms / Math.max(1, cold.records)).toFixed(2),
      "warm ms (median)": Math.round(median),
      "warm ms/record": +(median / Math.max(1, cold.records)).toFixed(2),
    });
  }
  console.table(rows);
}

main().then(
  () => process.exit(0),
  (error: unknown) => {
    console.error(error);
    process.exit(1);
  },
);

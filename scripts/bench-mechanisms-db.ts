/**
 * The mechanism check against the web benchmark's database of about 100 000 published datasets
 * (scripts/with-bench-db.sh; filled by `npm run bench:web`, or by `npm run bench:mechanisms`, which
 * fills it first when it is empty). Not a test: prints a table and the 5 s target.
 *
 * The mechanism (generated, invented rates): BENCH_REACTIONS (5 000) reactions over about
 * BENCH_SPECIES (1 000) species — up to half of them stored reactions of those species (so they
 * have published data; about 1 500 with the benchmark's data), the rest invented pairings (no data). Species go by their
 * stored names where a mechanism name can be one; the others by a short name the owner has mapped
 * before (species_mapping_choices, as a returning modeller's are). Then what the background job
 * does, stage by stage: read on a worker thread, match species and reactions, read every matched
 * reaction's published data, judge on the analysis threads, store the report. The owner's mappings
 * and the check are removed afterwards.
 */
import postgres from "postgres";
import { closeAnalysisPool, runAnalysisTask } from "@/lib/workers/pool";
import { buildReport } from "@/lib/mechanisms/run-check";
import { finishMechanismCheck } from "@/lib/mechanisms/queries";
import { seededRandom } from "@/lib/seeded-random";

const REACTIONS = Number(process.env.BENCH_REACTIONS ?? 5000);
const SPECIES = Number(process.env.BENCH_SPECIES ?? 1000);
const TARGET_MS = 5000;
/** The job's stages (lib/mechanisms/progress.ts) as the table names them. */
const STAGE_WORDS: Record<string, string> = {
  matching: "match species and reactions (database)",
  data: "read the matched reactions' data (database)",
  judging: "judge against the consensus (threads)",
};
const rand = seededRandom(20261204);
const sql = postgres(process.env.DATABASE_URL!, { max: 2, onnotice: () => {} });

const [{ datasets }] = await sql<{ datasets: number }[]>`select count(*)::int as datasets from datasets`;
if (datasets < 1000) {
  console.error(`The benchmark database holds ${datasets} datasets: fill it first (npm run bench:mechanisms does).`);
  process.exit(1);
}

// Stored reactions with their participants, fewest species first until about SPECIES species are covered.
const participants = await sql<{ reaction_id: number; side: string; coefficient: number; species_id: number }[]>`
  select p.reaction_id, p.side::text, p.coefficient, p.species_id from reaction_participants p
  where exists (select 1 from dataset_versions v where v.reaction_id = p.reaction_id and v.state = 'published')
  order by p.reaction_id`;
const byReaction = new Map<number, (typeof participants)[number][]>();
for (const p of participants) byReaction.set(p.reaction_id, [...(byReaction.get(p.reaction_id) ?? []), p]);
const reactionIds = [...byReaction.keys()].sort(() => rand() - 0.5);
const chosenSpecies = new Set<number>();
const chosenReactions: number[] = [];
for (const id of reactionIds) {
  if (chosenReactions.length >= REACTIONS / 2) break;
  // A mechanism writes both sides; stored reactions whose products were not given cannot be in one.
  if (!byReaction.get(id)!.some((p) => p.side === "product")) continue;
  const ids = byReaction.get(id)!.map((p) => p.species_id);
  if (chosenSpecies.size >= SPECIES && ids.some((s) => !chosenSpecies.has(s))) continue;
  ids.forEach((s) => chosenSpecies.add(s));
  chosenReactions.push(id);
}
const speciesRows = await sql<{ id: number; inchi_key: string; formula: string; name: string | null }[]>`
  select s.id, s.inchi_key, s.formula, (select n.name from species_names n where n.species_id = s.id order by length(n.name), n.name limit 1) as name
  from species s where s.id = any(${[...chosenSpecies]})`;
// A stored name serves when a mechanism can spell it (a letter first, no spaces or signs it reads otherwise).
const usable = (n: string | null): n is string => !!n && /^[A-Za-z][A-Za-z0-9()_,-]*$/.test(n) && !/^(?:M|HV|E)$/i.test(n);
const nameOf = new Map<number, string>();
const mapped: { name: string; speciesId: number }[] = [];
const used = new Set<string>();
for (const s of speciesRows) {
  let name = usable(s.name) && !used.has(s.name.toLowerCase()) ? s.name : null;
  if (!name) {
    name = `BS${String(s.id).padStart(5, "0")}`;
    mapped.push({ name, speciesId: s.id });
  }
  used.add(name.toLowerCase());
  nameOf.set(s.id, name);
}
const names = [...nameOf.values()];

const [owner] = await sql<{ id: number }[]>`select id from users where role = 'researcher' order by id limit 1`;
await sql`delete from species_mapping_choices where user_id = ${owner.id}`;
if (mapped.length)
  await sql`insert into species_mapping_choices ${sql(mapped.map((m) => ({ user_id: owner.id, name: m.name, species_id: m.speciesId })))}`;

const side = (id: number, s: string) =>
  byReaction
    .get(id)!
    .filter((p) => p.side === s)
    .map((p) => (p.coefficient === 1 ? nameOf.get(p.species_id)! : `${p.coefficient} ${nameOf.get(p.species_id)!}`))
    .join(" + ");
const rate = () =>
  `{A: ${(1e-12 * (0.2 + 5 * rand())).toExponential(3)}, b: ${(rand() * 1.5).toFixed(2)}, Ea: ${(200 + rand() * 3000).toFixed(0)}}`;
const equations = chosenReactions.map((id) => `${side(id, "reactant")} => ${side(id, "product")}`);
while (equations.length < REACTIONS) {
  const pick = () => names[Math.floor(rand() * names.length)];
  equations.push(`${pick()} + ${pick()} => ${pick()} + ${pick()}`);
}
const yaml = [
  "description: invented benchmark mechanism",
  "units: {length: cm, quantity: molec, activation-energy: K}",
  "species:",
  ...names.map((n) => `- name: ${n}`),
  "reactions:",
  ...equations.map((e) => `- equation: ${e}\n  rate-constant: ${rate()}`),
].join("\n");

// The server warms its analysis threads when it starts (lib/workers/pool.ts); so does the benchmark, untimed.
const tiny = new TextEncoder().encode("species:\n- name: X\nreactions: []\n");
await runAnalysisTask(
  "readMechanism",
  { bytes: tiny, json: false, window: { Tmin: 300, Tmax: 2500 }, format: "cantera-yaml" },
  {
    transfer: [tiny.buffer as ArrayBuffer],
  },
);

const rows: [string, number, string][] = [];
const started = performance.now();
let mark = started;
const lap = (stage: string, note = "") => {
  const now = performance.now();
  rows.push([stage, now - mark, note]);
  mark = now;
};

const bytes = new TextEncoder().encode(yaml);
const read = await runAnalysisTask(
  "readMechanism",
  { bytes, json: false, window: { Tmin: 300, Tmax: 2500 }, format: "cantera-yaml" },
  { transfer: [bytes.buffer as ArrayBuffer] },
);
if (!read.ok) throw new Error(`the generated mechanism was refused: ${read.message}`);
if (process.env.BENCH_SHOW_PROBLEMS) console.error(read.mechanism.problems.slice(0, 8));
lap(
  "read (worker thread)",
  `${read.mechanism.reactions.length} reactions, ${(yaml.length / 1e6).toFixed(1)} MB, ${read.mechanism.problems.length} problems`,
);

let stage = "";
const report = await buildReport({
  ownerId: owner.id,
  mechanism: read.mechanism,
  window: read.window,
  onProgress: (p) => {
    if (p.stage === stage) return;
    if (stage) lap(STAGE_WORDS[stage] ?? stage);
    stage = p.stage;
  },
});
lap(STAGE_WORDS[stage] ?? stage, `${report.reactions.filter((r) => r.datasets > 0).length} reactions judged`);

const [check] = await sql<{ id: number }[]>`
  insert into mechanism_checks (owner_id, name, source, format, window_tmin, window_tmax, total, state)
  values (${owner.id}, 'benchmark', ${yaml}, 'cantera-yaml', 300, 2500, ${REACTIONS}, 'running') returning id`;
await finishMechanismCheck({ id: check.id, report: report as unknown as Record<string, unknown> });
lap("store the report", `${(JSON.stringify(report).length / 1e6).toFixed(1)} MB of JSON`);
const total = performance.now() - started;

await sql`delete from mechanism_checks where id = ${check.id}`;
await sql`delete from species_mapping_choices where user_id = ${owner.id}`;

const s = report.summary;
if (process.env.BENCH_SHOW_PROBLEMS) {
  const notes = new Map<string, number>();
  for (const r of report.reactions.slice(0, chosenReactions.length))
    if (r.verdict === "no_data") notes.set(r.note.slice(0, 90), (notes.get(r.note.slice(0, 90)) ?? 0) + 1);
  console.error([...notes].sort((a, b) => b[1] - a[1]).slice(0, 8));
}
console.log(
  `\nMechanism check against the benchmark database: ${datasets} datasets; mechanism ${REACTIONS} reactions (${chosenReactions.length} of them stored reactions with published data, rates invented at random), ${names.length} species (${mapped.length} by the owner's mappings)\n`,
);
console.log(`${"stage".padEnd(40)} ${"ms".padStart(8)}  notes`);
for (const [name, ms, note] of rows) console.log(`${name.padEnd(40)} ${ms.toFixed(0).padStart(8)}  ${note}`);
console.log(
  `${"total".padEnd(40)} ${total.toFixed(0).padStart(8)}  ${total < TARGET_MS ? "under" : "OVER"} the ${TARGET_MS / 1000} s target`,
);
console.log(
  `\nverdicts: agrees ${s.agrees}, disagrees ${s.disagrees}, extrapolated ${s.extrapolated}, no data ${s.no_data}, not checked ${s.not_checked}; species unmatched ${s.speciesUnmatched}`,
);
await closeAnalysisPool();
await sql.end();
process.exit(0);

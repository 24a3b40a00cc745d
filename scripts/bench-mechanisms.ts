/**
 * The mechanism check's own cost: a generated mechanism of 5 000 reactions over 1 000 species
 * (invented names and numbers) read in both formats, matched to a catalogue of those species, and
 * judged against invented published data. Run with `npm run bench:mechanisms`. Not a test: prints
 * a table and the 5 s target.
 *
 * No database: the stages that query (species, reaction keys, each matched reaction's versions)
 * are replaced by in-memory maps, and the judging runs on this thread as one analysis worker runs
 * it. BENCH_MATCHED (share of reactions with published data, default 0.5) and
 * BENCH_DATASETS_PER_REACTION (default 5) say how much data the judging meets; the defaults stand
 * for a database of about 100 000 datasets over 20 000 reactions, of which the mechanism touches 2 500.
 */
import { GAS_CONSTANT } from "@/lib/kinetics/constants";
import { judgeReactions, type JudgeInput } from "@/lib/mechanisms/judge";
import { matchReaction, matchSpecies, mechanismReactionKeys, mechanismSpeciesNames, type CatalogueSpecies } from "@/lib/mechanisms/match";
import { readCanteraYamlMechanism } from "@/lib/mechanisms/read-cantera-yaml";
import { readMechanism } from "@/lib/mechanisms/read-mechanism";
import { readPlainTextMechanism } from "@/lib/mechanisms/read-plain-text";
import { seededRandom } from "@/lib/seeded-random";

const SPECIES = Number(process.env.BENCH_SPECIES ?? 1000);
const REACTIONS = Number(process.env.BENCH_REACTIONS ?? 5000);
const MATCHED = Number(process.env.BENCH_MATCHED ?? 0.5);
const PER_REACTION = Number(process.env.BENCH_DATASETS_PER_REACTION ?? 5);
const TARGET_MS = 5000;

const rand = seededRandom(20261203);
const letters = "ABCDEFGHIJKLMNOPQRSTUVWXYZ";
const inchiKeyOf = (i: number) => {
  let s = "";
  let x = i + 1;
  for (let k = 0; k < 14; k++) {
    s += letters[x % 26];
    x = Math.floor(x / 26) + k;
  }
  return `${s}-UHFFFAOYSA-N`;
};
const name = (i: number) => `SP${String(i).padStart(4, "0")}`;
const species = Array.from({ length: SPECIES }, (_, i) => ({ name: name(i), C: 1 + (i % 7), H: 2 + (i % 11), O: i % 3 }));
const reactions = Array.from({ length: REACTIONS }, (_, i) => {
  const pick = () => Math.floor(rand() * SPECIES);
  const [a, b, c, d] = [pick(), pick(), pick(), pick()];
  return { i, a, b, c, d, A: 1e-12 * (0.5 + rand()), b_: rand() * 2, E: 500 + rand() * 3000 };
});

const yaml = [
  "description: invented benchmark mechanism",
  "units: {length: cm, quantity: molec, activation-energy: K}",
  "species:",
  ...species.map((s) => `- name: ${s.name}\n  composition: {C: ${s.C}, H: ${s.H}, O: ${s.O}}`),
  "reactions:",
  ...reactions.map(
    (r) =>
      `- equation: ${name(r.a)} + ${name(r.b)} => ${name(r.c)} + ${name(r.d)}\n  rate-constant: {A: ${r.A.toExponential(4)}, b: ${r.b_.toFixed(3)}, Ea: ${r.E.toFixed(1)}}`,
  ),
].join("\n");
const plain = [
  "ELEMENTS C H O END",
  "SPECIES",
  ...Array.from({ length: Math.ceil(SPECIES / 10) }, (_, j) =>
    species
      .slice(j * 10, j * 10 + 10)
      .map((s) => s.name)
      .join(" "),
  ),
  "END",
  "REACTIONS MOLECULES KELVINS",
  ...reactions.map(
    (r) => `${name(r.a)}+${name(r.b)}=>${name(r.c)}+${name(r.d)}   ${r.A.toExponential(4)} ${r.b_.toFixed(3)} ${r.E.toFixed(1)}`,
  ),
  "END",
].join("\n");

function time<T>(fn: () => T): [T, number] {
  const start = performance.now();
  const value = fn();
  return [value, performance.now() - start];
}

const rows: [string, number, string][] = [];
const [, precheckYamlMs] = time(() => readMechanism(yaml));
const [fromYaml, yamlMs] = time(() => readCanteraYamlMechanism(yaml));
const [fromPlain, plainMs] = time(() => readPlainTextMechanism(plain));
rows.push([
  "read Cantera YAML (pre-check + reader)",
  precheckYamlMs,
  `${fromYaml.reactions.length} reactions, ${(yaml.length / 1e6).toFixed(1)} MB`,
]);
rows.push(["  of which the reader alone", yamlMs, ""]);
rows.push(["read plain text", plainMs, `${fromPlain.reactions.length} reactions, ${(plain.length / 1e6).toFixed(1)} MB`]);

// The catalogue the species query would return: every mechanism species under its name.
const byName = new Map<string, CatalogueSpecies[]>();
const byFormula = new Map<string, CatalogueSpecies[]>();
species.forEach((s, i) => {
  const entry = { inchiKey: inchiKeyOf(i), formula: `C${s.C}H${s.H}O${s.O}`, names: [s.name] };
  byName.set(s.name.toLowerCase(), [entry]);
  byFormula.set(entry.formula, [...(byFormula.get(entry.formula) ?? []), entry]);
});
const [matched, matchMs] = time(() => matchSpecies({ names: mechanismSpeciesNames(fromYaml), choices: new Map(), byName, byFormula }));
rows.push(["match species", matchMs, `${matched.filter((m) => m.inchiKey).length} of ${matched.length} matched`]);

const ids = new Map(matched.map((m) => [m.name, m.inchiKey]));
const [keyed, keyMs] = time(() => fromYaml.reactions.map((r) => mechanismReactionKeys(r, ids)));
// The stored reactions: a share of the mechanism's forward keys (the reaction-key query's answer).
const stored = new Map<string, number>();
keyed.forEach((k, i) => {
  if ("keys" in k && i < MATCHED * REACTIONS) stored.set(k.keys.forward, i + 1);
});
const [matches, reactionMatchMs] = time(() => keyed.map((k) => ("keys" in k ? matchReaction(k.keys, stored) : null)));
rows.push(["reaction keys + match", keyMs + reactionMatchMs, `${matches.filter((m) => m?.forward).length} with data`]);

// Invented published data for each matched reaction, as the versions query returns them.
const inputs: JudgeInput[] = [];
fromYaml.reactions.forEach((r, i) => {
  if (!matches[i]?.forward || !r.rate) return;
  const truth = { lnA: Math.log(r.rate.A), b: r.rate.b, Ea: r.rate.Ea };
  const versions = Array.from({ length: PER_REACTION }, (_, j) => {
    const Tmin = 250 + 50 * j;
    const points = Array.from({ length: 8 }, (_, p) => {
      const T = Tmin + (400 * p) / 7;
      return { T, k: Math.exp(truth.lnA + truth.b * Math.log(T) - truth.Ea / (GAS_CONSTANT * T) + 0.1 * (rand() - 0.5)), sigmaLnK: 0.1 };
    });
    return {
      versionId: i * 100 + j,
      datasetId: i * 100 + j,
      number: 1,
      title: `invented ${i}.${j}`,
      state: "published",
      versionIdentifier: null,
      payload: { method: { category: "experiment" }, reaction: { order: 2 } },
      points,
      analysis: { flags: [] },
      tMin: Tmin,
      tMax: Tmin + 400,
    };
  });
  inputs.push({ index: r.index, rate: r.rate, order: r.order, versions, exclusions: [] });
});
const [judged, judgeMs] = time(() => judgeReactions({ window: { Tmin: 300, Tmax: 2500 }, reactions: inputs }));
const counts = judged.reduce<Record<string, number>>((c, j) => ((c[j.verdict] = (c[j.verdict] ?? 0) + 1), c), {});
rows.push([
  "judge against the consensus",
  judgeMs,
  `${inputs.length} reactions × ${PER_REACTION} datasets; ${Object.entries(counts)
    .map(([k, v]) => `${k} ${v}`)
    .join(", ")}`,
]);

const total = precheckYamlMs + matchMs + keyMs + reactionMatchMs + judgeMs;
rows.push([
  "total (YAML path, without database queries)",
  total,
  total < TARGET_MS ? `under the ${TARGET_MS / 1000} s target` : `OVER the ${TARGET_MS / 1000} s target`,
]);

console.log(`\nMechanism check: ${REACTIONS} reactions, ${SPECIES} species (generated, invented)\n`);
console.log(`${"stage".padEnd(46)} ${"ms".padStart(9)}  notes`);
for (const [stage, ms, note] of rows) console.log(`${stage.padEnd(46)} ${ms.toFixed(0).padStart(9)}  ${note}`);

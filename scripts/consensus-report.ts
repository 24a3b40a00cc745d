// npm run consensus:report -- <reaction id | words of its equation>: prints what a reaction page says
// about each dataset's place in the consensus (the reader's default choice), as plain text.
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import { DEFAULT_CONSENSUS_CHOICE } from "@/lib/reactions/consensus-selection";
import { listReactionsWithPublicData } from "@/lib/reactions/queries";

const arg = process.argv.slice(2).join(" ").trim();
if (!arg) {
  console.error("usage: npm run consensus:report -- <reaction id | words of its equation>");
  process.exit(2);
}
const reactions = await listReactionsWithPublicData();
const normal = (s: string) => s.replace(/\s+/g, "").toLowerCase();
const found = /^\d+$/.test(arg)
  ? reactions.find((r) => r.id === Number(arg))
  : reactions.find((r) => normal(r.equation).includes(normal(arg)));
if (!found) {
  console.error(`No reaction with public data matches "${arg}". Reactions: ${reactions.map((r) => `${r.id} ${r.equation}`).join("; ")}`);
  process.exit(1);
}
const { selection, result, unavailable } = await loadReactionConsensus({ reactionId: found.id, choice: DEFAULT_CONSENSUS_CHOICE });
console.log(`Reaction ${found.id}: ${found.equation}`);
if (!result) {
  console.log(unavailable);
  process.exit(0);
}
const title = new Map(selection.used.map((d) => [String(d.versionId), `${d.title} (${d.kind})`]));
for (const d of selection.notUsed) title.set(String(d.versionId), `${d.title} (${d.kind})`);
console.log(
  `Consensus: ${result.preferred}, ${result.included} of ${result.datasets} datasets, ${Math.round(result.range.Tmin)}–${Math.round(result.range.Tmax)} K`,
);
for (const m of result.members) {
  const share = m.share === null || m.shareT === null ? "" : `, share ${(100 * m.share).toFixed(0)} % at ${Math.round(m.shareT)} K`;
  console.log(`\n- ${title.get(m.id) ?? m.id} [version ${m.id}]${share}`);
  console.log(`  ${m.verdict}`);
}
console.log("\nShares in the consensus k̂ (each row adds up to 100 %):");
for (const row of result.shares) {
  console.log(`  ${Math.round(row.T)} K: ${row.shares.map((x) => `version ${x.id} ${(100 * x.share).toFixed(0)} %`).join("; ")}`);
}
for (const f of result.flags) console.log(`\nflag ${f.code}${f.datasetIds ? ` (${f.datasetIds.join(", ")})` : ""}: ${f.message}`);
process.exit(0);

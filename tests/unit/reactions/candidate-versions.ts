import type { CandidateVersion } from "@/lib/reactions/consensus-selection";

// Constructed data for consensus tests (invented): k = 2e-12 exp(−1500 K / T) cm³ molecule⁻¹ s⁻¹ at the given
// temperatures, times `factor`.
export const pointsAt = (Ts: number[], factor = 1) => Ts.map((T) => ({ T, k: factor * 2e-12 * Math.exp(-1500 / T) }));

let nextId = 100;

/** A published version of one reaction, a new id each call; `points` overrides the points made at `Ts`. */
export function candidateVersion(
  over: Partial<CandidateVersion> & { category?: string; order?: number; Ts?: number[] } = {},
): CandidateVersion {
  const { category = "experiment", order = 2, Ts = [250, 300, 350, 400], ...rest } = over;
  const id = nextId++;
  return {
    versionId: id,
    datasetId: id + 1000,
    number: 1,
    title: `Dataset ${id}`,
    state: "published",
    versionIdentifier: null,
    payload: { method: { category, technique: "x" }, reaction: { order } },
    points: pointsAt(Ts),
    ...rest,
  };
}

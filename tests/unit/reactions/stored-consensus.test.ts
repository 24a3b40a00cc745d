import { describe, expect, it } from "vitest";
import {
  DEFAULT_CONSENSUS_CHOICE,
  runSelectedConsensus,
  selectConsensusDatasets,
  type CandidateVersion,
  type CuratorExclusion,
} from "@/lib/reactions/consensus-selection";
import { consensusInputKey, readStoredConsensus, storedConsensusOf } from "@/lib/reactions/stored-consensus";
import { candidateVersion, pointsAt } from "./candidate-versions";

// Constructed data (a caching test, not a check of the numbers; invented): the shared k(T) with a per-dataset
// factor and a small alternating scatter, so the engine has something to weigh.
const version = (factor: number, Ts = [250, 300, 350, 400, 450]) =>
  candidateVersion({ Ts, points: pointsAt(Ts, factor).map((p, i) => ({ ...p, k: p.k * (1 + (i % 2 ? 0.03 : -0.03)) })) });

const ENGINE = "engine-test-1";
const versions = [version(1), version(1.1), version(0.92), version(30)];
const select = (vs: CandidateVersion[], exclusions: CuratorExclusion[] = []) =>
  selectConsensusDatasets({ versions: vs, exclusions, choice: DEFAULT_CONSENSUS_CHOICE });
// What the database hands back: the kept value after a JSON round trip.
const throughJson = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

describe("the consensus kept with a reaction's summary", () => {
  it("is read back, equal to the engine's own answer, for the same input", () => {
    const selection = select(versions);
    const run = runSelectedConsensus(selection);
    expect(run.result).not.toBeNull();
    const kept = throughJson(storedConsensusOf(selection, run, ENGINE));
    // The page's input comes through the data cache (JSON too): the same fingerprint.
    const again = select(throughJson(versions));
    expect(consensusInputKey(again)).toBe(consensusInputKey(selection));
    expect(readStoredConsensus(kept, again, ENGINE)).toEqual(run);
  });

  it("keeps the answer that there is no consensus (one dataset), with its sentence", () => {
    const selection = select(versions.slice(0, 1));
    const run = runSelectedConsensus(selection);
    expect(run.result).toBeNull();
    expect(readStoredConsensus(throughJson(storedConsensusOf(selection, run, ENGINE)), selection, ENGINE)).toEqual(run);
  });

  it("is not used for any other input: a new version, a changed point, a curator exclusion, another engine", () => {
    const selection = select(versions);
    const kept = throughJson(storedConsensusOf(selection, runSelectedConsensus(selection), ENGINE));
    expect(readStoredConsensus(kept, select([...versions, version(1.05)]), ENGINE)).toBeNull();
    const moved = versions.map((v, i) =>
      i === 1 ? { ...v, points: v.points.map((p, j) => (j === 2 ? { ...p, k: p.k * 1.001 } : p)) } : v,
    );
    expect(readStoredConsensus(kept, select(moved), ENGINE)).toBeNull();
    const excluded: CuratorExclusion[] = [{ versionId: versions[0].versionId, reason: "calibration doubt", excludedAt: new Date(0) }];
    expect(readStoredConsensus(kept, select(versions, excluded), ENGINE)).toBeNull();
    expect(readStoredConsensus(kept, selection, "engine-test-2")).toBeNull();
  });

  it("is never read when it is missing, malformed, or held a number JSON cannot keep", () => {
    const selection = select(versions);
    const run = runSelectedConsensus(selection);
    for (const bad of [null, undefined, "x", 3, {}, { engine: ENGINE }, { engine: ENGINE, input: consensusInputKey(selection) }])
      expect(readStoredConsensus(bad, selection, ENGINE)).toBeNull();
    const withInfinity = { ...run, result: { ...run.result!, T0: Number.POSITIVE_INFINITY } };
    expect(readStoredConsensus(throughJson(storedConsensusOf(selection, withInfinity, ENGINE)), selection, ENGINE)).toBeNull();
  });
});

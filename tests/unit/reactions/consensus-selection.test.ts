import { describe, expect, it } from "vitest";
import {
  DEFAULT_CONSENSUS_CHOICE,
  consensusChoiceQuery,
  describeChoice,
  parseConsensusChoice,
  runSelectedConsensus,
  selectConsensusDatasets,
  selectionToJson,
  withEngineLeftOut,
  type ConsensusChoice,
  type CuratorExclusion,
} from "@/lib/reactions/consensus-selection";

import { candidateVersion as version, pointsAt } from "./candidate-versions";

const choice = (c: Partial<ConsensusChoice> = {}): ConsensusChoice => ({ ...DEFAULT_CONSENSUS_CHOICE, ...c });
const reasonCodes = (sel: ReturnType<typeof selectConsensusDatasets>, versionId: number) =>
  sel.notUsed.find((d) => d.versionId === versionId)?.reasons.map((r) => r.code) ?? [];

describe("parseConsensusChoice", () => {
  it("defaults to measured and calculated at every temperature", () => {
    expect(parseConsensusChoice(new URLSearchParams(""))).toEqual({ ok: true, choice: { include: "all", Tmin: null, Tmax: null } });
  });

  it("reads include and the window; blank fields (as a form sends them) mean not set", () => {
    expect(parseConsensusChoice(new URLSearchParams("include=measured&Tmin=250.5&Tmax=4e2"))).toEqual({
      ok: true,
      choice: { include: "measured", Tmin: 250.5, Tmax: 400 },
    });
    expect(parseConsensusChoice(new URLSearchParams("include=&Tmin=&Tmax= "))).toEqual({ ok: true, choice: DEFAULT_CONSENSUS_CHOICE });
    expect(parseConsensusChoice({ include: "calculated", Tmax: "500", other: undefined })).toEqual({
      ok: true,
      choice: { include: "calculated", Tmin: null, Tmax: 500 },
    });
  });

  it.each(["abc", "-5", "0", "Infinity", "1e400", "0x10", "300K", "NaN", "3,5"])("refuses Tmin=%s, naming the parameter", (raw) => {
    const out = parseConsensusChoice(new URLSearchParams({ Tmin: raw }));
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.errors).toHaveLength(1);
      expect(out.errors[0]).toMatchObject({ parameter: "Tmin", value: raw });
      expect(out.errors[0].message).toMatch(/^Tmin must be a temperature in kelvin/);
      // A refused choice never leaks half-read values.
      expect(out.choice).toEqual(DEFAULT_CONSENSUS_CHOICE);
    }
  });

  it("refuses an unknown include, a window that is empty, and repeated parameters", () => {
    const bad = parseConsensusChoice(new URLSearchParams("include=evaluated&Tmin=400&Tmax=300&Tmax=350"));
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors.map((e) => e.parameter).sort()).toEqual(["Tmax", "include"]);
    const equal = parseConsensusChoice(new URLSearchParams("Tmin=300&Tmax=300"));
    expect(equal.ok).toBe(false);
    if (!equal.ok) expect(equal.errors[0]).toMatchObject({ parameter: "Tmax", message: "Tmax (300 K) must be above Tmin (300 K)" });
  });

  it("ignores unknown parameters on pages, refuses them in strict mode (a mistyped tmin is not silently dropped)", () => {
    expect(parseConsensusChoice(new URLSearchParams("tmin=300&utm=x")).ok).toBe(true);
    const strict = parseConsensusChoice(new URLSearchParams("tmin=300"), { strict: true });
    expect(strict.ok).toBe(false);
    if (!strict.ok)
      expect(strict.errors[0]).toMatchObject({ parameter: "tmin", message: expect.stringMatching(/Unknown query parameter “tmin”/) });
  });

  it("round-trips through the query it writes", () => {
    const c = { include: "calculated" as const, Tmin: 212.5, Tmax: 1500 };
    const q = consensusChoiceQuery(c);
    expect(q).toBe("?include=calculated&Tmin=212.5&Tmax=1500");
    expect(parseConsensusChoice(new URLSearchParams(q.slice(1)))).toEqual({ ok: true, choice: c });
    expect(consensusChoiceQuery(DEFAULT_CONSENSUS_CHOICE)).toBe("");
  });
});

describe("selectConsensusDatasets: which data go in", () => {
  it("takes measured and calculated, never evaluated, even with include=all", () => {
    const measured = version();
    const calculated = version({ category: "theory" });
    const evaluated = version({ category: "evaluation" });
    const sel = selectConsensusDatasets({ versions: [measured, calculated, evaluated], exclusions: [], choice: choice() });
    expect(sel.used.map((d) => [d.versionId, d.kind])).toEqual([
      [measured.versionId, "measured"],
      [calculated.versionId, "calculated"],
    ]);
    expect(reasonCodes(sel, evaluated.versionId)).toEqual(["evaluated"]);
    expect(sel.notUsed[0].reasons[0].message).toMatch(/count the same data twice/);
    expect(sel.inputs.map((i) => i.id)).toEqual([String(measured.versionId), String(calculated.versionId)]);
    expect(sel.order).toBe(2);
  });

  it("keeps one kind when asked, saying why the other kind stays out", () => {
    const measured = version();
    const calculated = version({ category: "theory" });
    const onlyMeasured = selectConsensusDatasets({
      versions: [measured, calculated],
      exclusions: [],
      choice: choice({ include: "measured" }),
    });
    expect(onlyMeasured.used.map((d) => d.versionId)).toEqual([measured.versionId]);
    expect(onlyMeasured.notUsed[0]).toMatchObject({
      versionId: calculated.versionId,
      reasons: [{ code: "not_chosen", message: "Calculated; the choice is measured datasets only." }],
    });
    const onlyCalculated = selectConsensusDatasets({
      versions: [measured, calculated],
      exclusions: [],
      choice: choice({ include: "calculated" }),
    });
    expect(onlyCalculated.used.map((d) => d.versionId)).toEqual([calculated.versionId]);
  });

  it("never takes a retracted version, nor one whose method is not stated", () => {
    const retracted = version({ state: "retracted", number: 2 });
    const unknown = version({ payload: { reaction: { order: 2 } } });
    const sel = selectConsensusDatasets({ versions: [retracted, unknown, version()], exclusions: [], choice: choice() });
    expect(reasonCodes(sel, retracted.versionId)).toEqual(["retracted"]);
    expect(sel.notUsed.find((d) => d.versionId === retracted.versionId)!.reasons[0].message).toMatch(/earlier versions are superseded/);
    expect(reasonCodes(sel, unknown.versionId)).toEqual(["unknown_method"]);
    expect(sel.used).toHaveLength(1);
  });

  it("leaves out what a curator excluded, with the curator's reason, and lists only exclusions of these versions", () => {
    const a = version();
    const b = version({ category: "evaluation" });
    const exclusions: CuratorExclusion[] = [
      { versionId: a.versionId, reason: "k is per molecule of product, not of reactant", excludedAt: new Date("2026-01-02T03:04:05Z") },
      { versionId: b.versionId, reason: "duplicate of another record", excludedAt: new Date("2026-01-02T03:04:05Z") },
      { versionId: 1, reason: "a version of another reaction", excludedAt: new Date("2026-01-02T03:04:05Z") },
    ];
    const sel = selectConsensusDatasets({ versions: [a, b], exclusions, choice: choice() });
    expect(sel.used).toEqual([]);
    expect(sel.notUsed.find((d) => d.versionId === a.versionId)!.reasons).toEqual([
      { code: "excluded_by_curator", message: "Left out by a curator: k is per molecule of product, not of reactant" },
    ]);
    // Every reason that applies is given, not only the first.
    expect(reasonCodes(sel, b.versionId)).toEqual(["evaluated", "excluded_by_curator"]);
    expect(sel.curatorExclusions.map((e) => e.versionId)).toEqual([a.versionId, b.versionId]);
    expect(selectionToJson(sel).curatorExclusions[0]).toEqual({
      versionId: a.versionId,
      reason: "k is per molecule of product, not of reactant",
      excludedAt: "2026-01-02T03:04:05.000Z",
    });
  });

  it("drops points outside the window (bounds inclusive) and lists datasets left with fewer than two temperatures", () => {
    const wide = version({ Ts: [200, 250, 300, 350, 400, 450] });
    const oneInside = version({ Ts: [280, 300, 300, 420] });
    const noneInside = version({ Ts: [500, 600] });
    const sel = selectConsensusDatasets({
      versions: [wide, oneInside, noneInside],
      exclusions: [],
      choice: choice({ Tmin: 300, Tmax: 400 }),
    });
    expect(sel.used).toEqual([expect.objectContaining({ versionId: wide.versionId, points: 6, pointsUsed: 3, Tmin: 300, Tmax: 400 })]);
    expect(sel.inputs[0].points.map((p) => p.T)).toEqual([300, 350, 400]);
    expect(sel.notUsed.find((d) => d.versionId === oneInside.versionId)!.reasons).toEqual([
      {
        code: "outside_window",
        message: "Only 2 of its 4 points lie within 300 K to 400 K, at one temperature; a fit needs at least two.",
      },
    ]);
    expect(sel.notUsed.find((d) => d.versionId === noneInside.versionId)!.reasons[0].message).toBe(
      "None of its points (500 K to 600 K) lie within 300 K to 400 K.",
    );
  });

  it("an open-ended window keeps everything on its open side", () => {
    const v = version({ Ts: [200, 300, 400] });
    expect(selectConsensusDatasets({ versions: [v], exclusions: [], choice: choice({ Tmin: 300 }) }).inputs[0].points).toHaveLength(2);
    expect(selectConsensusDatasets({ versions: [v], exclusions: [], choice: choice({ Tmax: 300 }) }).inputs[0].points).toHaveLength(2);
  });

  it("a dataset measured at one temperature only cannot be fitted", () => {
    const single = version({ Ts: [298, 298] });
    const sel = selectConsensusDatasets({ versions: [single], exclusions: [], choice: choice() });
    expect(sel.notUsed[0].reasons).toEqual([
      { code: "too_few_temperatures", message: "All its points are at one temperature (298 K); a fit needs at least two." },
    ]);
    expect(sel.order).toBeNull();
  });

  it("uses the order most datasets have and lists the others", () => {
    const a = version({ order: 2 });
    const b = version({ order: 2 });
    const c = version({ order: 3 });
    const sel = selectConsensusDatasets({ versions: [c, a, b], exclusions: [], choice: choice() });
    expect(sel.order).toBe(2);
    expect(sel.used.map((d) => d.versionId)).toEqual([a.versionId, b.versionId]);
    expect(reasonCodes(sel, c.versionId)).toEqual(["other_order"]);
  });

  it("describes the choice in one sentence", () => {
    expect(describeChoice(choice())).toBe("Measured and calculated datasets, every temperature; evaluated datasets never enter.");
    expect(describeChoice(choice({ include: "measured", Tmin: 250, Tmax: 400 }))).toBe(
      "Measured datasets, points from 250 K to 400 K; evaluated datasets never enter.",
    );
    expect(describeChoice(choice({ Tmax: 400 }))).toMatch(/points from up to 400 K/);
  });
});

describe("runSelectedConsensus", () => {
  it("needs two datasets and says so", () => {
    const sel = selectConsensusDatasets({ versions: [version()], exclusions: [], choice: choice() });
    expect(runSelectedConsensus(sel)).toEqual({
      result: null,
      unavailable: "A consensus needs at least 2 datasets; only one of this choice can enter.",
    });
    const none = selectConsensusDatasets({ versions: [], exclusions: [], choice: choice() });
    expect(runSelectedConsensus(none).unavailable).toMatch(/none of this choice/);
  });

  it("runs the engine on exactly the selected datasets and points", () => {
    const a = version({ Ts: [220, 260, 300, 340, 380] });
    const b = version({ Ts: [240, 280, 320, 360, 400], points: pointsAt([240, 280, 320, 360, 400], 1.2) });
    const evaluated = version({ category: "evaluation", points: pointsAt([250, 300, 350], 1000) });
    const sel = selectConsensusDatasets({ versions: [a, b, evaluated], exclusions: [], choice: choice({ Tmax: 360 }) });
    const { result, unavailable } = runSelectedConsensus(sel);
    expect(unavailable).toBeNull();
    expect(result).not.toBeNull();
    expect(result!.members.map((m) => m.id).sort()).toEqual([String(a.versionId), String(b.versionId)].sort());
    expect(result!.points).toBe(4 + 4);
    expect(result!.range.Tmax).toBeLessThanOrEqual(360);
  });

  it("turns input the engine refuses into a plain reason, not an error", () => {
    const a = version();
    const broken = version({
      points: [
        { T: 300, k: 1e-14 },
        { T: 350, k: -1 },
      ],
    });
    const { result, unavailable } = runSelectedConsensus(
      selectConsensusDatasets({ versions: [a, broken], exclusions: [], choice: choice() }),
    );
    expect(result).toBeNull();
    expect(unavailable).toMatch(/^No consensus for this choice: /);
  });

  it("compares a dataset left out by a curator with the consensus, without letting it into the fit or the count", () => {
    const a = version({ Ts: [220, 260, 300, 340, 380] });
    const b = version({ Ts: [240, 280, 320, 360, 400], points: pointsAt([240, 280, 320, 360, 400], 1.02) });
    const x = version({ points: pointsAt([250, 300, 350, 400], 3) });
    const exclusions: CuratorExclusion[] = [
      { versionId: x.versionId, reason: "superseded by a later measurement.", excludedAt: new Date() },
    ];
    const sel = selectConsensusDatasets({ versions: [a, b, x], exclusions, choice: choice() });
    expect(sel.used.map((d) => d.versionId)).toEqual([a.versionId, b.versionId]);
    expect(reasonCodes(sel, x.versionId)).toEqual(["excluded_by_curator"]);
    const { result, unavailable } = runSelectedConsensus(sel);
    expect(unavailable).toBeNull();
    const without = runSelectedConsensus(selectConsensusDatasets({ versions: [a, b], exclusions: [], choice: choice() })).result!;
    expect(result!.included).toBe(2);
    expect(result!.arrhenius.params.Ea / without.arrhenius.params.Ea).toBeCloseTo(1, 10);
    const m = result!.members.find((d) => d.id === String(x.versionId))!;
    expect(m).toMatchObject({ included: false, leftOut: "by a curator (superseded by a later measurement)" });
    expect(m.disagreement!.off).toBe(true);
    expect(m.verdict).toMatch(
      /is off the consensus: .* above .*Left out of the consensus: by a curator \(superseded by a later measurement\)\.$/,
    );
    // One dataset in the fit is not a consensus, however many are compared with it.
    const one = runSelectedConsensus(selectConsensusDatasets({ versions: [a, x], exclusions, choice: choice() }));
    expect(one).toEqual({ result: null, unavailable: "A consensus needs at least 2 datasets; only one of this choice can enter." });
    // Kept out for another reason too (here: evaluated), it is not compared.
    const evaluated = version({ category: "evaluation" });
    const both = selectConsensusDatasets({
      versions: [a, b, evaluated],
      exclusions: [{ versionId: evaluated.versionId, reason: "duplicate", excludedAt: new Date() }],
      choice: choice(),
    });
    expect(both.inputs.map((d) => d.id)).toEqual([String(a.versionId), String(b.versionId)]);
  });

  it("lists a dataset the engine leaves out as a likely unit mistake among the datasets not used, with that reason", () => {
    const a = version({ Ts: [220, 260, 300, 340, 380] });
    const b = version({ Ts: [240, 280, 320, 360, 400], points: pointsAt([240, 280, 320, 360, 400], 1.02) });
    const c = version({ Ts: [230, 270, 310, 350, 390], points: pointsAt([230, 270, 310, 350, 390], 0.98) });
    const wrong = version({ points: pointsAt([250, 300, 350, 400], 1e3) });
    const sel = selectConsensusDatasets({ versions: [a, b, c, wrong], exclusions: [], choice: choice() });
    expect(sel.used).toHaveLength(4);
    const { result } = runSelectedConsensus(sel);
    expect(result!.members.find((m) => m.id === String(wrong.versionId))!.unitSuspect).toMatch(/10³/);
    const after = withEngineLeftOut(sel, result);
    expect(after.used.map((d) => d.versionId)).toEqual([a.versionId, b.versionId, c.versionId]);
    const listed = after.notUsed.find((d) => d.versionId === wrong.versionId)!;
    expect(listed).toMatchObject({ datasetId: wrong.datasetId, points: 4, kind: "measured" });
    expect(listed).not.toHaveProperty("pointsUsed");
    expect(listed.reasons).toEqual([
      {
        code: "unit_suspect",
        message:
          "Left out by the consensus: its rate constants are off the others by about a factor of 10³ (L ↔ cm³), a likely unit mistake; check its units.",
      },
    ]);
    expect(selectionToJson(after).notUsed.map((d) => d.versionId)).toEqual([wrong.versionId]);
    // Nothing moves without a result or without a unit mistake.
    expect(withEngineLeftOut(sel, null)).toBe(sel);
    const fine = selectConsensusDatasets({ versions: [a, b, c], exclusions: [], choice: choice() });
    expect(withEngineLeftOut(fine, runSelectedConsensus(fine).result)).toBe(fine);
  });

  it("names an outlier by its number in the dataset when a window drops earlier points", () => {
    const Ts = [200, 210, 250, 270, 290, 310, 330, 350, 370, 390];
    const points = pointsAt(Ts).map((p, i) => (i === 5 ? { ...p, k: p.k * 4 } : p));
    const a = version({ points });
    const b = version({ Ts: [240, 280, 320, 360, 400], points: pointsAt([240, 280, 320, 360, 400], 1.02) });
    const sel = selectConsensusDatasets({ versions: [a, b], exclusions: [], choice: choice({ Tmin: 240 }) });
    expect(sel.inputs[0].pointNumbers).toEqual([3, 4, 5, 6, 7, 8, 9, 10]);
    const m = runSelectedConsensus(sel).result!.members.find((d) => d.id === String(a.versionId))!;
    // Point 6 of the dataset is the 4th point inside the window.
    expect(m.outliers).toEqual([3]);
    expect(m.verdict).toMatch(/Point 6, an outlier of its own fit, is left out of its summary\.$/);
  });
});

describe("selectConsensusDatasets: outliers from the stored analyses", () => {
  const analysis = { flags: [{ code: "outlier", points: [2] }] };
  it("hands the engine a stored analysis' outliers when the window keeps every point, never when it cuts some", () => {
    const a = version({ analysis, Ts: [250, 280, 300, 350, 400] });
    const b = version({ analysis: { flags: [] } });
    const c = version({ analysis: null });
    const all = selectConsensusDatasets({ versions: [a, b, c], exclusions: [], choice: choice() });
    expect(all.inputs.map((i) => i.outliers)).toEqual([[2], [], undefined]);
    const cut = selectConsensusDatasets({ versions: [a, b, c], exclusions: [], choice: choice({ Tmin: 260 }) });
    expect(cut.inputs.map((i) => i.outliers)).toEqual([undefined, undefined, undefined]);
  });

  it("ignores a stored list it cannot read", () => {
    const bad = version({ analysis: { flags: [{ code: "outlier", points: [7] }] } });
    const sel = selectConsensusDatasets({ versions: [bad, version()], exclusions: [], choice: choice() });
    expect(sel.inputs[0].outliers).toBeUndefined();
  });
});

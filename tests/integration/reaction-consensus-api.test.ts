import { renderToStaticMarkup } from "react-dom/server";
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));
vi.mock("@/lib/mail/queue", () => ({ enqueueMail: vi.fn() }));
vi.mock("@/lib/identifiers/queue", () => ({ enqueueIdentifierRegistration: vi.fn() }));

import { GET } from "@/app/api/v1/reactions/[id]/consensus/route";
import ReactionPage from "@/app/reactions/[id]/page";
import { getCurrentUser } from "@/lib/auth/session";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { reactionSegment } from "@/lib/reactions/paths";
import { saveConsensusExclusion } from "@/lib/reactions/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { consensusDocument, publish } from "./consensus-fixtures";
import { sql, uniqueEmail } from "./helpers";

/**
 * GET /api/v1/reactions/:id/consensus and the reaction page against the real database: one
 * reaction of its own (Br + n-butane) with measured, calculated, evaluated and retracted datasets.
 */
const CARBONS = 4;
let owner: UserDto, curator: UserDto;
let reactionId: number;
const ids: Record<"measuredA" | "measuredB" | "calculated" | "evaluated" | "retracted" | "excluded", number> = {
  measuredA: 0,
  measuredB: 0,
  calculated: 0,
  evaluated: 0,
  retracted: 0,
  excluded: 0,
};
const EXCLUSION_REASON = "Rate constants are per molecule of HBr formed, not per Br consumed.";

beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("cons-owner"), name: "Consensus Owner", passwordHash: "x", verified: true });
  curator = await createUser({
    email: uniqueEmail("cons-cur"),
    name: "Consensus Curator",
    passwordHash: "x",
    role: "curator",
    verified: true,
  });
  const doc = (title: string, category: "experiment" | "theory" | "evaluation", over: { Ts?: number[]; factor?: number } = {}) =>
    consensusDocument({ carbons: CARBONS, title: `Br + butane ${title}`, category, ...over });
  const as = { owner, curator };
  const a = await publish(doc("measured A", "experiment"), as);
  reactionId = a.reactionId;
  ids.measuredA = a.versionId;
  ids.measuredB = (await publish(doc("measured B", "experiment", { Ts: [260, 300, 330, 360, 420], factor: 1.1 }), as)).versionId;
  ids.calculated = (await publish(doc("calculated", "theory", { Ts: [300, 400, 500, 600, 800, 1000], factor: 0.9 }), as)).versionId;
  ids.evaluated = (await publish(doc("evaluated", "evaluation", { Ts: [250, 300, 350, 400] }), as)).versionId;
  ids.retracted = (await publish(doc("retracted", "experiment", { factor: 3 }), { ...as, retract: true })).versionId;
  ids.excluded = (await publish(doc("left out", "experiment", { factor: 50 }), as)).versionId;
  await saveConsensusExclusion({ versionId: ids.excluded, actorId: curator.id, reason: EXCLUSION_REASON });
  // A draft of the same reaction is invisible here.
  await depositNewDataset({ actor: owner, document: doc("draft", "experiment") });
}, 120_000);

const get = (query = "", id: string | number = reactionId) =>
  GET(new Request(`http://127.0.0.1/api/v1/reactions/${id}/consensus${query}`), { params: Promise.resolve({ id: String(id) }) });

type Body = {
  data: {
    reaction: { id: number; equation: string };
    units: { T: string; k: string | null };
    selection: {
      include: string;
      Tmin: number | null;
      Tmax: number | null;
      description: string;
      order: number | null;
      used: { versionId: number; kind: string; points: number; pointsUsed: number; Tmin: number; Tmax: number }[];
      notUsed: { versionId: number; reasons: { code: string; message: string }[] }[];
      curatorExclusions: { versionId: number; reason: string; excludedAt: string }[];
    };
    consensus: {
      members: { id: string; included: boolean; leftOut: string | null; disagreement: { off: boolean } | null }[];
      included: number;
      points: number;
      range: { Tmin: number; Tmax: number };
    } | null;
    unavailable: string | null;
    caution: string;
  };
};

const reasonsOf = (body: Body, versionId: number) =>
  body.data.selection.notUsed.find((d) => d.versionId === versionId)?.reasons.map((r) => r.code);

describe("GET /api/v1/reactions/:id/consensus: what went in", () => {
  it("by default: measured and calculated; never evaluated, retracted or left out by a curator; drafts unseen", async () => {
    const res = await get();
    expect(res.status).toBe(200);
    const body = (await res.json()) as Body;
    const { selection, consensus } = body.data;
    expect(selection).toMatchObject({ include: "all", Tmin: null, Tmax: null, order: 2 });
    expect(selection.used.map((d) => d.versionId).sort()).toEqual([ids.measuredA, ids.measuredB, ids.calculated].sort());
    expect(selection.used.find((d) => d.versionId === ids.calculated)).toMatchObject({ kind: "calculated", points: 6, pointsUsed: 6 });
    expect(reasonsOf(body, ids.evaluated)).toEqual(["evaluated"]);
    expect(reasonsOf(body, ids.retracted)).toEqual(["retracted"]);
    expect(reasonsOf(body, ids.excluded)).toEqual(["excluded_by_curator"]);
    expect(selection.notUsed.find((d) => d.versionId === ids.excluded)!.reasons[0].message).toBe(
      `Left out by a curator: ${EXCLUSION_REASON}`,
    );
    expect(selection.curatorExclusions).toEqual([{ versionId: ids.excluded, reason: EXCLUSION_REASON, excludedAt: expect.any(String) }]);
    // Six public datasets, nothing else: the draft is not listed at all.
    expect(selection.used.length + selection.notUsed.length).toBe(6);
    // The engine fitted exactly the used datasets, all their points; the one a curator left out is only compared.
    expect(consensus).not.toBeNull();
    expect(consensus!.members.map((m) => m.id).sort()).toEqual(
      [ids.measuredA, ids.measuredB, ids.calculated, ids.excluded].map(String).sort(),
    );
    expect(consensus!.included).toBe(3);
    expect(consensus!.points).toBe(6 + 5 + 6);
    expect(consensus!.members.find((m) => m.id === String(ids.excluded))).toMatchObject({
      included: false,
      leftOut: `by a curator (${EXCLUSION_REASON.replace(/\.$/, "")})`,
      disagreement: { off: true },
    });
    expect(body.data.unavailable).toBeNull();
    expect(body.data.units).toEqual({ T: "K", k: "cm3 molecule-1 s-1" });
    expect(body.data.caution).toMatch(/Extrapolation/);
    expect(body.data.reaction.id).toBe(reactionId);
  });

  it("include=measured and include=calculated keep one kind, saying why the other is out", async () => {
    const measured = (await (await get("?include=measured")).json()) as Body;
    expect(measured.data.selection.used.map((d) => d.versionId).sort()).toEqual([ids.measuredA, ids.measuredB].sort());
    expect(reasonsOf(measured, ids.calculated)).toEqual(["not_chosen"]);
    expect(measured.data.consensus!.members.filter((m) => m.included)).toHaveLength(2);

    const calculated = (await (await get("?include=calculated")).json()) as Body;
    expect(calculated.data.selection.used.map((d) => d.versionId)).toEqual([ids.calculated]);
    expect(calculated.data.consensus).toBeNull();
    expect(calculated.data.unavailable).toBe("A consensus needs at least 2 datasets; only one of this choice can enter.");
  });

  it("a temperature window drops points before the fit and lists datasets left with too few temperatures", async () => {
    const body = (await (await get("?Tmin=300&Tmax=400")).json()) as Body;
    const { used } = body.data.selection;
    expect(used.find((d) => d.versionId === ids.calculated)).toMatchObject({ points: 6, pointsUsed: 2, Tmin: 300, Tmax: 400 });
    expect(used.find((d) => d.versionId === ids.measuredA)).toMatchObject({ points: 6, pointsUsed: 4, Tmin: 310, Tmax: 400 });
    expect(body.data.consensus!.range.Tmin).toBeGreaterThanOrEqual(300);
    expect(body.data.consensus!.range.Tmax).toBeLessThanOrEqual(400);
    expect(body.data.consensus!.points).toBe(4 + 3 + 2);

    const high = (await (await get("?Tmin=450")).json()) as Body;
    expect(high.data.selection.used.map((d) => d.versionId)).toEqual([ids.calculated]);
    expect(reasonsOf(high, ids.measuredA)).toEqual(["outside_window"]);
    expect(high.data.selection.notUsed.find((d) => d.versionId === ids.measuredA)!.reasons[0].message).toBe(
      "None of its points (250 K to 400 K) lie within 450 K and above.",
    );
    expect(high.data.consensus).toBeNull();
    expect(high.data.selection.description).toBe(
      "Measured and calculated datasets, points from 450 K and above; evaluated datasets never enter.",
    );
  });

  const badCases: [string, string[], RegExp][] = [
    ["?Tmin=abc", ["Tmin"], /Tmin must be a temperature in kelvin/],
    ["?Tmax=-20", ["Tmax"], /Tmax must be a temperature in kelvin/],
    ["?Tmin=1e999", ["Tmin"], /Tmin must be/],
    ["?include=evaluated", ["include"], /include must be measured, calculated or all/],
    ["?Tmin=400&Tmax=300", ["Tmax"], /must be above Tmin/],
    ["?tmin=300", ["tmin"], /Unknown query parameter “tmin”/],
    ["?Tmin=300&Tmin=310", ["Tmin"], /Give Tmin once/],
    ["?include=x&Tmin=y", ["include", "Tmin"], /2 query parameters are not valid \(include, Tmin\)/],
    ["?a%2Fb=1", ["a/b"], /Unknown query parameter/],
  ];
  for (const [query, parameters, title] of badCases) {
    it(`400 for ${query}, naming ${parameters.join(", ")}`, async () => {
      const res = await get(query);
      expect(res.status).toBe(400);
      expect(res.headers.get("content-type")).toBe("application/problem+json");
      const problem = await res.json();
      expect(problem).toMatchObject({ status: 400, code: "bad_request" });
      expect(problem.title).toMatch(title);
      expect(problem.errors.map((e: { parameter: string }) => e.parameter)).toEqual(parameters);
      for (const e of problem.errors) expect(e.pointer).toBe(`/${e.parameter.replace(/~/g, "~0").replace(/\//g, "~1")}`);
    });
  }

  it("the reaction key, as the reaction page's address writes it (with ~ or >>), answers as the numeric id does", async () => {
    const byId = (await (await get("?include=measured")).json()) as Body;
    const segment = await segmentOf(reactionId);
    for (const written of [segment, segment.replace("~", ">>")]) {
      const res = await get("?include=measured", written);
      expect(res.status).toBe(200);
      expect(((await res.json()) as Body).data.consensus).toEqual(byId.data.consensus);
    }
    expect((await get("", "not-a-key")).status).toBe(404);
  });

  it("404 for a reaction that does not exist or that only drafts describe", async () => {
    expect((await get("", 2147483646)).status).toBe(404);
    const owner2 = await createUser({ email: uniqueEmail("cons-draft"), name: "Draft Only", passwordHash: "x", verified: true });
    const draft = await depositNewDataset({
      actor: owner2,
      document: consensusDocument({ carbons: 7, title: "Br + heptane draft only", category: "experiment" }),
    });
    const [{ reaction_id: draftReaction }] = await sql`select reaction_id from dataset_versions where id = ${draft.id}`;
    const res = await get("", draftReaction);
    expect(res.status).toBe(404);
    expect((await res.json()).title).toBe("No such reaction with published data");
  });
});

/** The reaction page's path segment: its key, written URL-safe. */
const segmentOf = async (id: number) => reactionSegment((await sql`select key from reactions where id = ${id}`)[0].key);

describe("the reaction page says the same", () => {
  const render = async (searchParams: Record<string, string>) =>
    renderToStaticMarkup(
      (await ReactionPage({
        params: Promise.resolve({ id: await segmentOf(reactionId) }),
        searchParams: Promise.resolve(searchParams),
      })) as never,
    );

  it("shows the choice form (GET, labelled fields) and what went in, with the curator's reason", async () => {
    vi.mocked(getCurrentUser).mockResolvedValue(null);
    const html = await render({ include: "measured", Tmin: "260" });
    const form = /<form [^>]*>/.exec(html.slice(html.indexOf("Choose the data")))![0];
    expect(form).toContain('method="get"');
    expect(form).toContain(`action="/reactions/${await segmentOf(reactionId)}"`);
    expect(html).toContain('<label for="choice-Tmin"');
    expect(html).toMatch(/name="Tmin"[^>]*value="260"|value="260"[^>]*name="Tmin"/);
    expect(html).toContain("What went into the consensus");
    expect(html).toContain("Measured datasets, points from 260 K and above; evaluated datasets never enter.");
    expect(html).toContain(`Left out by a curator: ${EXCLUSION_REASON}`);
    expect(html).toContain("Calculated; the choice is measured datasets only.");
    // The datasets table says what each dataset is against the others, never a bare dash; the excluded one says it was left out.
    const table = html.slice(html.indexOf('id="list-heading"'));
    expect(table).not.toContain('<td class="min-w-56">—</td>');
    expect(table.toLowerCase()).toContain("left out");
    // Readers get no curator controls.
    expect(html).not.toContain("Leave out of the consensus");
  });

  it("says when the choice in the URL cannot be read, and falls back to the default", async () => {
    const html = await render({ Tmin: "warm" });
    expect(html).toContain("This choice could not be read");
    // In the form's words: the field is labelled "From (K)", not by its query name.
    expect(html).toContain("“From (K)” must be a temperature in kelvin");
    expect(html).not.toContain("Tmin must be");
    expect(html).toContain('aria-invalid="true"');
    expect(html).toContain("Measured and calculated datasets, every temperature");
  });

  it("offers curators the controls, for published versions only", async () => {
    vi.mocked(getCurrentUser).mockResolvedValue(curator);
    const html = await render({});
    expect(html).toContain("Curators: leave a dataset out");
    expect(html).toContain("Include again");
    // Five published versions, one already left out; the retracted one gets no control.
    expect(html.match(/Leave out of the consensus/g)).toHaveLength(4);
    expect(html.match(/Change the reason/g)).toHaveLength(1);
    vi.mocked(getCurrentUser).mockResolvedValue(null);
  });
});

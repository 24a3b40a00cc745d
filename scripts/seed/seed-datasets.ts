import "server-only";
import { applyTransition } from "@/lib/curation/transitions";
import type { Transition } from "@/lib/curation/lifecycle";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { hasDatasetTitled } from "@/lib/datasets/queries";
import { GAS_CONSTANT } from "@/lib/kinetics";
import { getUserByEmail, type UserDto } from "@/lib/users/queries";
import { seededRandom } from "@/lib/seeded-random";
import { recordDemoHistory } from "./demo-waiting";

/**
 * The demo's datasets. Molecules are real; every number, title and person is invented for the
 * demo (k from made-up Arrhenius parameters with seeded pseudo-random scatter).
 */

interface ReactionSpec {
  id: string;
  reactants: [string, string][]; // [name, SMILES]
  products: [string, string][];
  cls: string;
  order: 1 | 2 | 3;
  /** Invented parameters in canonical units: A, n, E/R (K). */
  A: number;
  n: number;
  EoverR: number;
}

const reactions: ReactionSpec[] = [
  {
    id: "oh-ch4",
    reactants: [
      ["hydroxyl", "[OH]"],
      ["methane", "C"],
    ],
    products: [
      ["water", "O"],
      ["methyl", "[CH3]"],
    ],
    cls: "hydrogen-abstraction",
    order: 2,
    A: 2.3e-12,
    n: 0,
    EoverR: 1760,
  },
  {
    id: "oh-c2h6",
    reactants: [
      ["hydroxyl", "[OH]"],
      ["ethane", "CC"],
    ],
    products: [
      ["water", "O"],
      ["ethyl", "C[CH2]"],
    ],
    cls: "hydrogen-abstraction",
    order: 2,
    A: 7.9e-12,
    n: 0,
    EoverR: 1000,
  },
  {
    id: "cl-ch4",
    reactants: [
      ["chlorine atom", "[Cl]"],
      ["methane", "C"],
    ],
    products: [
      ["hydrogen chloride", "Cl"],
      ["methyl", "[CH3]"],
    ],
    cls: "hydrogen-abstraction",
    order: 2,
    A: 7.0e-12,
    n: 0,
    EoverR: 1280,
  },
  {
    id: "oh-c2h4",
    reactants: [
      ["hydroxyl", "[OH]"],
      ["ethene", "C=C"],
    ],
    products: [["2-hydroxyethyl", "OC[CH2]"]],
    cls: "addition",
    order: 2,
    A: 1.9e-12,
    n: 0,
    EoverR: -420,
  },
  {
    id: "ch3-ch3",
    reactants: [
      ["methyl", "[CH3]"],
      ["methyl", "[CH3]"],
    ],
    products: [["ethane", "CC"]],
    cls: "recombination",
    order: 2,
    A: 6.0e-11,
    n: -0.4,
    EoverR: 0,
  },
  {
    id: "c2h5cl",
    reactants: [["chloroethane", "CCCl"]],
    products: [
      ["ethene", "C=C"],
      ["hydrogen chloride", "Cl"],
    ],
    cls: "elimination",
    order: 1,
    A: 3.0e13,
    n: 0,
    EoverR: 28500,
  },
  {
    id: "c2h6-fission",
    reactants: [["ethane", "CC"]],
    products: [
      ["methyl", "[CH3]"],
      ["methyl", "[CH3]"],
    ],
    cls: "bond-fission",
    order: 1,
    A: 2.0e16,
    n: 0,
    EoverR: 44000,
  },
  {
    id: "no-o3",
    reactants: [
      ["nitric oxide", "[N]=O"],
      ["ozone", "[O-][O+]=O"],
    ],
    products: [
      ["nitrogen dioxide", "[O]N=O"],
      ["oxygen", "O=O"],
    ],
    cls: "other",
    order: 2,
    A: 2.8e-12,
    n: 0,
    EoverR: 1450,
  },
  {
    id: "cl-ch3br",
    reactants: [
      ["chlorine atom", "[Cl]"],
      ["bromomethane", "CBr"],
    ],
    products: [
      ["chloromethane", "CCl"],
      ["bromine atom", "[Br]"],
    ],
    cls: "substitution",
    order: 2,
    A: 1.2e-11,
    n: 0,
    EoverR: 2600,
  },
  {
    id: "cyclopropane",
    reactants: [["cyclopropane", "C1CC1"]],
    products: [["propene", "C=CC"]],
    cls: "isomerisation",
    order: 1,
    A: 2.8e15,
    n: 0,
    EoverR: 32900,
  },
  {
    id: "c2h5-disp",
    reactants: [
      ["ethyl", "C[CH2]"],
      ["ethyl", "C[CH2]"],
    ],
    products: [
      ["ethene", "C=C"],
      ["ethane", "CC"],
    ],
    cls: "radical-disproportionation",
    order: 2,
    A: 2.4e-12,
    n: 0,
    EoverR: 0,
  },
  {
    id: "o1d-ch4",
    reactants: [
      ["oxygen atom (excited)", "[O]"],
      ["methane", "C"],
    ],
    products: [["methanol", "CO"]],
    cls: "insertion",
    order: 2,
    A: 1.3e-10,
    n: 0,
    EoverR: 0,
  },
  // Search needs several reactions of one species, names that differ between authors (the published
  // names become synonyms: "hydroxyl radical", "OH") and classes with several reactions each.
  {
    id: "oh-ch3oh",
    reactants: [
      ["hydroxyl radical", "[OH]"],
      ["methanol", "CO"],
    ],
    products: [
      ["water", "O"],
      ["hydroxymethyl", "[CH2]O"],
    ],
    cls: "hydrogen-abstraction",
    order: 2,
    A: 3.1e-12,
    n: 0,
    EoverR: 390,
  },
  {
    id: "oh-hcho",
    reactants: [
      ["OH", "[OH]"],
      ["formaldehyde", "C=O"],
    ],
    products: [
      ["water", "O"],
      ["formyl", "[CH]=O"],
    ],
    cls: "hydrogen-abstraction",
    order: 2,
    A: 5.0e-12,
    n: 0,
    EoverR: -140,
  },
  {
    id: "h-c2h4",
    reactants: [
      ["hydrogen atom", "[H]"],
      ["ethylene", "C=C"],
    ],
    products: [["ethyl", "C[CH2]"]],
    cls: "addition",
    order: 2,
    A: 9.0e-11,
    n: 0,
    EoverR: 1150,
  },
];

/** Deterministic pseudo-random numbers so every demo database is the same. */
const rng = seededRandom;

interface DatasetSpec {
  reaction: string;
  owner: "tanaka" | "varga" | "lindqvist" | "adeyemi";
  Tmin: number;
  Tmax: number;
  n: number;
  scatter: number;
  /** States to walk through after the draft is made. */
  path: ("submit" | "review" | "changes" | "accept" | "decline" | "retract")[];
  special?: "outlier" | "curved" | "unit_mistake" | "reported_disagrees";
  technique?: string;
}

const P = ["submit", "review", "accept"] as const;
const specs: DatasetSpec[] = [
  { reaction: "oh-ch4", owner: "tanaka", Tmin: 220, Tmax: 420, n: 10, scatter: 0.05, path: [...P] },
  { reaction: "oh-ch4", owner: "varga", Tmin: 250, Tmax: 400, n: 8, scatter: 0.06, path: [...P], special: "outlier" },
  {
    reaction: "oh-ch4",
    owner: "lindqvist",
    Tmin: 200,
    Tmax: 2000,
    n: 16,
    scatter: 0.02,
    path: [...P],
    special: "curved",
    technique: "transition-state theory with tunnelling correction",
  },
  { reaction: "oh-ch4", owner: "varga", Tmin: 260, Tmax: 380, n: 7, scatter: 0.05, path: ["submit"], special: "unit_mistake" },
  { reaction: "oh-c2h6", owner: "tanaka", Tmin: 230, Tmax: 400, n: 9, scatter: 0.05, path: [...P] },
  {
    reaction: "oh-c2h6",
    owner: "adeyemi",
    Tmin: 250,
    Tmax: 1500,
    n: 12,
    scatter: 0.03,
    path: [...P],
    special: "curved",
    technique: "variational transition-state theory",
  },
  { reaction: "oh-c2h6", owner: "varga", Tmin: 240, Tmax: 360, n: 6, scatter: 0.07, path: ["submit", "review"] },
  { reaction: "cl-ch4", owner: "tanaka", Tmin: 200, Tmax: 300, n: 8, scatter: 0.04, path: [...P] },
  { reaction: "cl-ch4", owner: "varga", Tmin: 220, Tmax: 320, n: 7, scatter: 0.05, path: [...P], special: "reported_disagrees" },
  {
    reaction: "cl-ch4",
    owner: "lindqvist",
    Tmin: 200,
    Tmax: 1000,
    n: 10,
    scatter: 0.02,
    path: ["submit", "review", "changes"],
    technique: "canonical variational theory",
  },
  { reaction: "oh-c2h4", owner: "tanaka", Tmin: 200, Tmax: 350, n: 8, scatter: 0.05, path: [...P] },
  { reaction: "oh-c2h4", owner: "varga", Tmin: 220, Tmax: 330, n: 6, scatter: 0.06, path: [...P] },
  { reaction: "oh-c2h4", owner: "tanaka", Tmin: 230, Tmax: 300, n: 5, scatter: 0.05, path: [] },
  {
    reaction: "ch3-ch3",
    owner: "adeyemi",
    Tmin: 300,
    Tmax: 1500,
    n: 10,
    scatter: 0.03,
    path: [...P],
    technique: "RRKM/master equation, high-pressure limit",
  },
  { reaction: "ch3-ch3", owner: "varga", Tmin: 300, Tmax: 600, n: 6, scatter: 0.08, path: [...P] },
  { reaction: "ch3-ch3", owner: "tanaka", Tmin: 290, Tmax: 500, n: 6, scatter: 0.08, path: ["submit"] },
  { reaction: "c2h5cl", owner: "varga", Tmin: 650, Tmax: 800, n: 8, scatter: 0.06, path: [...P], technique: "shock tube" },
  { reaction: "c2h5cl", owner: "lindqvist", Tmin: 600, Tmax: 1200, n: 10, scatter: 0.02, path: [...P] },
  {
    reaction: "c2h5cl",
    owner: "varga",
    Tmin: 660,
    Tmax: 760,
    n: 5,
    scatter: 0.1,
    path: ["submit", "review", "decline"],
    technique: "static reactor",
  },
  { reaction: "c2h6-fission", owner: "adeyemi", Tmin: 1000, Tmax: 2000, n: 11, scatter: 0.03, path: [...P] },
  { reaction: "c2h6-fission", owner: "tanaka", Tmin: 1100, Tmax: 1500, n: 7, scatter: 0.1, path: [...P], technique: "shock tube" },
  {
    reaction: "c2h6-fission",
    owner: "tanaka",
    Tmin: 1150,
    Tmax: 1450,
    n: 6,
    scatter: 0.1,
    path: [...P, "retract"],
    technique: "shock tube",
  },
  { reaction: "no-o3", owner: "tanaka", Tmin: 200, Tmax: 320, n: 9, scatter: 0.04, path: [...P] },
  { reaction: "no-o3", owner: "varga", Tmin: 210, Tmax: 300, n: 7, scatter: 0.05, path: [...P] },
  { reaction: "no-o3", owner: "varga", Tmin: 220, Tmax: 310, n: 6, scatter: 0.05, path: ["submit", "review", "changes"] },
  { reaction: "no-o3", owner: "tanaka", Tmin: 230, Tmax: 300, n: 5, scatter: 0.05, path: [] },
  { reaction: "cl-ch3br", owner: "tanaka", Tmin: 250, Tmax: 400, n: 8, scatter: 0.06, path: [...P] },
  { reaction: "cl-ch3br", owner: "lindqvist", Tmin: 250, Tmax: 1000, n: 10, scatter: 0.02, path: ["submit"] },
  { reaction: "cyclopropane", owner: "varga", Tmin: 700, Tmax: 800, n: 7, scatter: 0.04, path: [...P], technique: "static reactor" },
  { reaction: "cyclopropane", owner: "adeyemi", Tmin: 600, Tmax: 1200, n: 10, scatter: 0.02, path: [...P] },
  { reaction: "cyclopropane", owner: "varga", Tmin: 690, Tmax: 790, n: 6, scatter: 0.05, path: ["submit", "review", "decline"] },
  { reaction: "c2h5-disp", owner: "adeyemi", Tmin: 300, Tmax: 1000, n: 8, scatter: 0.04, path: [...P] },
  { reaction: "c2h5-disp", owner: "tanaka", Tmin: 300, Tmax: 500, n: 6, scatter: 0.1, path: ["submit", "review"] },
  { reaction: "o1d-ch4", owner: "tanaka", Tmin: 200, Tmax: 350, n: 7, scatter: 0.06, path: [...P] },
  { reaction: "o1d-ch4", owner: "varga", Tmin: 220, Tmax: 340, n: 6, scatter: 0.07, path: [...P] },
  { reaction: "o1d-ch4", owner: "lindqvist", Tmin: 200, Tmax: 400, n: 6, scatter: 0.02, path: [] },
  {
    reaction: "oh-ch4",
    owner: "adeyemi",
    Tmin: 250,
    Tmax: 2500,
    n: 14,
    scatter: 0.02,
    path: [...P, "retract"],
    technique: "transition-state theory",
  },
  { reaction: "cl-ch4", owner: "varga", Tmin: 210, Tmax: 300, n: 6, scatter: 0.05, path: ["submit", "review", "changes"] },
  { reaction: "oh-c2h6", owner: "lindqvist", Tmin: 250, Tmax: 600, n: 8, scatter: 0.02, path: [] },
  { reaction: "ch3-ch3", owner: "adeyemi", Tmin: 300, Tmax: 2000, n: 9, scatter: 0.02, path: ["submit", "review"] },
  { reaction: "oh-ch3oh", owner: "tanaka", Tmin: 230, Tmax: 420, n: 9, scatter: 0.05, path: [...P], technique: "flash photolysis" },
  { reaction: "oh-ch3oh", owner: "adeyemi", Tmin: 250, Tmax: 1500, n: 10, scatter: 0.02, path: [...P] },
  { reaction: "oh-hcho", owner: "varga", Tmin: 220, Tmax: 400, n: 8, scatter: 0.05, path: [...P], technique: "flash photolysis" },
  { reaction: "h-c2h4", owner: "lindqvist", Tmin: 300, Tmax: 1200, n: 10, scatter: 0.02, path: [...P] },
  { reaction: "h-c2h4", owner: "varga", Tmin: 290, Tmax: 500, n: 7, scatter: 0.06, path: [...P], technique: "discharge flow" },
];

const theorists = new Set(["lindqvist", "adeyemi"]);

function buildDocument(spec: DatasetSpec, index: number, owner: UserDto) {
  const r = reactions.find((x) => x.id === spec.reaction)!;
  const rand = rng(1000 + index);
  const points = Array.from({ length: spec.n }, (_, i) => {
    // Even in 1/T, as most experiments are planned.
    const T = 1 / (1 / spec.Tmin - (i / (spec.n - 1)) * (1 / spec.Tmin - 1 / spec.Tmax));
    // Curved sets follow (T/T0)^2.4 exp(2.4 (1 − T0/T)): equal to the base expression at T0, curving away from it.
    const curvature = spec.special === "curved" ? Math.pow(T / 298.15, 2.4) * Math.exp(2.4 * (1 - 298.15 / T)) : Math.pow(T / 298.15, r.n);
    let k = r.A * curvature * Math.exp(-r.EoverR / T);
    k *= Math.exp(spec.scatter * (rand() + rand() + rand() - 1.5) * 2); // ≈ normal noise
    if (spec.special === "outlier" && i === Math.floor(spec.n / 2)) k *= 4;
    if (spec.special === "unit_mistake") k *= 6.02214076e23; // per-mole values labelled per molecule
    const Tr = Math.round(T * 10) / 10;
    return {
      T: Tr,
      k: Number(k.toPrecision(3)),
      uncertainty: { kind: "relative", value: Math.round(spec.scatter * 200), confidence: "2sigma" },
    };
  });
  const kUnit = r.order === 1 ? "s-1" : r.order === 2 ? "cm3 molecule-1 s-1" : "cm6 molecule-2 s-1";
  const theory = theorists.has(spec.owner);
  const eq = `${r.reactants.map((x) => x[0]).join(" + ")} → ${r.products.map((x) => x[0]).join(" + ")}`;
  const doc: Record<string, unknown> = {
    title: `${eq}: ${theory ? "computed" : "measured"} rate constants, ${spec.Tmin}–${spec.Tmax} K`,
    description: `${theory ? "Computed" : "Measured"} rate constants for ${eq} over ${spec.Tmin}–${spec.Tmax} K. Demo record: every number is invented.`,
    keywords: [r.cls.replace(/_/g, " "), "demo"],
    license: "CC-BY-4.0",
    creators: [{ name: owner.name, ...(owner.affiliation ? { affiliation: owner.affiliation } : {}) }],
    reaction: {
      reactants: r.reactants.map(([name, smiles]) => ({ name, smiles, coefficient: 1 })),
      products: r.products.map(([name, smiles]) => ({ name, smiles, coefficient: 1 })),
      class: r.cls,
      order: r.order,
      phase: "gas",
    },
    method: theory
      ? { category: "theory", technique: spec.technique ?? "transition-state theory", notes: "Demo record." }
      : {
          category: "experiment",
          technique: spec.technique ?? "pulsed laser photolysis",
          detection: "laser-induced fluorescence",
          notes: "Demo record.",
        },
    conditions: { pressure: { value: 100 }, bathGas: "He" },
    units: { k: kUnit, T: "K", pressure: "Torr" },
    points,
    source: {
      reference: {
        type: "report",
        title: `Arrhenia demo data set ${index + 1}`,
        author: [{ literal: owner.name }],
        issued: { "date-parts": [[2026]] },
      },
      locator: `Table ${1 + (index % 3)}`,
    },
  };
  if (spec.special === "reported_disagrees") {
    // The authors' own expression, with an activation energy that their data do not support.
    doc.reportedFit = {
      model: "arrhenius",
      A: r.A,
      Ea: ((r.EoverR + 600) * GAS_CONSTANT) / 1000,
      EaUnit: "kJ mol-1",
      Tmin: spec.Tmin,
      Tmax: spec.Tmax,
    };
  }
  return doc;
}

const reasons: Record<string, string> = {
  accept: "Complete provenance; fits and checks are consistent.",
  changes: "Please state the bath-gas pressure of each point and the source table.",
  decline: "The temperature range is too narrow to add to the existing datasets.",
  retract: "Retracted at the authors' request: a calibration error was found after publication.",
};

/** Creates each demo dataset once (matched by owner and title); returns how many were created now. */
export async function seedDemoDatasets(): Promise<number> {
  const people: Record<string, UserDto> = {};
  for (const key of ["tanaka", "varga", "lindqvist", "adeyemi", "curator.hale", "curator.mensah"]) {
    const u = await getUserByEmail({ email: `${key}@demo.arrhenia.invalid` });
    if (!u) throw new Error(`demo person ${key} is missing; seed the people first`);
    people[key] = u;
  }
  let made = 0;
  // Invented waiting times of the queued demo submissions, in hours: from under a day to two weeks.
  const WAITED_HOURS = [5, 28, 52, 77, 150, 230, 340, 19, 101];
  let queued = 0;
  let undated = false;
  for (const [i, spec] of specs.entries()) {
    const owner = people[spec.owner];
    const curator = i % 2 ? people["curator.hale"] : people["curator.mensah"];
    const document = buildDocument(spec, i, owner);
    if (await hasDatasetTitled({ ownerId: owner.id, title: document.title as string })) continue;
    const steps = spec.path.map((step): [Transition, UserDto, string | undefined] =>
      step === "submit"
        ? ["submit", owner, undefined]
        : step === "review"
          ? ["start_review", curator, undefined]
          : step === "changes"
            ? ["return", curator, reasons.changes]
            : step === "accept"
              ? ["accept", curator, reasons.accept]
              : step === "decline"
                ? ["decline", curator, reasons.decline]
                : ["retract", curator, reasons.retract],
    );
    // Directly through the lifecycle (audited), without queuing mail for the demo.
    // Identifiers minted here are registered when the app starts (scripts/serve.ts queues every pending one).
    const last = spec.path.at(-1);
    if (last === "submit" || last === "review" || last === "changes") {
      // Still waiting: deposited a few hours before it was submitted `hours` ago; each later step a
      // while after the one before, all in the past, in order.
      const hours = WAITED_HOURS[queued++ % WAITED_HOURS.length];
      const { dated } = await recordDemoHistory(async (at) => {
        await at(hours + 3);
        const version = await depositNewDataset({ actor: owner, document });
        for (const [n, [transition, actor, reason]] of steps.entries()) {
          await at(hours * (1 - n / (steps.length + 1)));
          await applyTransition({ versionId: version.id, actorId: actor.id, transition, reason });
        }
      });
      undated ||= !dated;
    } else {
      const version = await depositNewDataset({ actor: owner, document });
      for (const [transition, actor, reason] of steps)
        await applyTransition({ versionId: version.id, actorId: actor.id, transition, reason });
    }
    made++;
  }
  if (undated)
    console.warn(
      "[arrhenia] demo seed: no schema owner connection (MIGRATION_DATABASE_URL), so the queue's demo submissions all wait under 1 h",
    );
  return made;
}

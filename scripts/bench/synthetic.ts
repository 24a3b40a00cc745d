/**
 * Synthetic published data for the web benchmark (`npm run bench:web`): species, reactions and
 * deposit documents, all invented and all reproducible from one seed. Species are real structures
 * (substituted alkanes and their radicals, described by RDKit through lib/chem, so InChIKeys,
 * formulas and masses are genuine) under invented, systematic-looking names; reactions, people,
 * titles, journals and every number are made up. Nothing here is taken from any publication.
 */
import type { DepositDocument } from "@/lib/deposits";
import { seededRandom } from "@/lib/seeded-random";
import { LICENCES, TECHNIQUE_SUGGESTIONS, type ReactionClassId } from "@/lib/deposits/vocabulary";

/** Uniform, integer, pick and normal draws from one seed (lib/seeded-random.ts). */
export function randomFrom(seed: number) {
  const next = seededRandom(seed);
  const uniform = (lo: number, hi: number) => lo + (hi - lo) * next();
  const int = (lo: number, hi: number) => Math.floor(uniform(lo, hi + 1));
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)];
  /** Box–Muller standard normal. */
  const normal = () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
  const weighted = <T>(entries: readonly (readonly [T, number])[]): T => {
    const total = entries.reduce((s, [, w]) => s + w, 0);
    let r = next() * total;
    for (const [v, w] of entries) if ((r -= w) < 0) return v;
    return entries[entries.length - 1][0];
  };
  return { next, uniform, int, pick, normal, weighted, chance: (p: number) => next() < p };
}
export type Random = ReturnType<typeof randomFrom>;

// ---------------------------------------------------------------------------------------------
// Species

export interface SpeciesSeed {
  smiles: string;
  /** The name documents use; the first of `names`. */
  names: string[];
  /** Abstracted-hydrogen partner: the product HX this atom or radical X forms (by SMILES). */
  abstracts?: string;
  /** SMILES of the radical left when a terminal hydrogen is taken from this molecule. */
  radical?: string;
  radicalName?: string;
}

/** Small atoms, radicals and molecules every kineticist types; their names are ordinary chemistry words. */
export const SMALL_SPECIES: SpeciesSeed[] = [
  { smiles: "[OH]", names: ["OH", "hydroxyl radical", "hydroxyl"], abstracts: "O" },
  { smiles: "[Cl]", names: ["Cl", "chlorine atom", "atomic chlorine"], abstracts: "Cl" },
  { smiles: "[H]", names: ["H", "hydrogen atom", "atomic hydrogen"], abstracts: "[H][H]" },
  { smiles: "[O]", names: ["O", "oxygen atom", "O(3P)"], abstracts: "[OH]" },
  { smiles: "[Br]", names: ["Br", "bromine atom"], abstracts: "Br" },
  { smiles: "[F]", names: ["F", "fluorine atom"], abstracts: "F" },
  { smiles: "[CH3]", names: ["CH3", "methyl radical", "methyl"], abstracts: "C" },
  { smiles: "[O]O", names: ["HO2", "hydroperoxyl radical", "hydroperoxyl"], abstracts: "OO" },
  { smiles: "[O]N(=O)=O", names: ["NO3", "nitrate radical"], abstracts: "O[N+](=O)[O-]" },
  { smiles: "[C]#N", names: ["CN", "cyano radical"], abstracts: "C#N" },
  { smiles: "O", names: ["H2O", "water"] },
  { smiles: "Cl", names: ["HCl", "hydrogen chloride"] },
  { smiles: "[H][H]", names: ["H2", "hydrogen", "dihydrogen"] },
  { smiles: "Br", names: ["HBr", "hydrogen bromide"] },
  { smiles: "F", names: ["HF", "hydrogen fluoride"] },
  { smiles: "C", names: ["CH4", "methane"], radical: "[CH3]", radicalName: "CH3" },
  { smiles: "OO", names: ["H2O2", "hydrogen peroxide"] },
  { smiles: "O[N+](=O)[O-]", names: ["HNO3", "nitric acid"] },
  { smiles: "C#N", names: ["HCN", "hydrogen cyanide"] },
  { smiles: "O=O", names: ["O2", "oxygen", "dioxygen"] },
  { smiles: "[O-][O+]=O", names: ["O3", "ozone"] },
  { smiles: "[N]=O", names: ["NO", "nitric oxide", "nitrogen monoxide"] },
  { smiles: "N(=O)[O]", names: ["NO2", "nitrogen dioxide"] },
];

const ALKANES = [
  "methane",
  "ethane",
  "propane",
  "butane",
  "pentane",
  "hexane",
  "heptane",
  "octane",
  "nonane",
  "decane",
  "undecane",
  "dodecane",
  "tridecane",
  "tetradecane",
  "pentadecane",
  "hexadecane",
];
/** Substituent: name prefix, SMILES branch, bonds it takes from its carbon. */
const SUBSTITUENTS: [string, string, number][] = [
  ["chloro", "Cl", 1],
  ["fluoro", "F", 1],
  ["bromo", "Br", 1],
  ["hydroxy", "O", 1],
  ["methyl", "C", 1],
  ["oxo", "=O", 2],
  ["ethyl", "CC", 1],
  ["iodo", "I", 1],
  ["amino", "N", 1],
  ["nitro", "[N+](=O)[O-]", 1],
  ["cyano", "C#N", 1],
  ["methoxy", "OC", 1],
];

function chainSmiles(n: number, subs: Map<number, [string, string, number][]>, radicalAt: number | null): string | null {
  let s = "";
  for (let i = 0; i < n; i++) {
    const here = subs.get(i) ?? [];
    const used = (i > 0 ? 1 : 0) + (i < n - 1 ? 1 : 0) + here.reduce((t, [, , b]) => t + b, 0);
    if (used > 4) return null;
    let atom = "C";
    if (radicalAt === i) {
      const h = 4 - used - 1;
      if (h < 0) return null;
      atom = h === 0 ? "[C]" : h === 1 ? "[CH]" : `[CH${h}]`;
    }
    s += atom + here.map(([, b]) => `(${b})`).join("");
  }
  return s;
}

/**
 * Substituted alkanes (one or two substituents on a straight chain) and, for each, the radical
 * left by taking a hydrogen from the far end of the chain. Names are built like systematic names
 * ("2-chloro-3-methylpentane", "2-chloro-3-methylpentyl"); some molecules get a second, older-style
 * name as a synonym. Duplicates by structure are removed later, by InChIKey.
 */
export function* moleculeSeeds(): Generator<SpeciesSeed> {
  for (let n = 2; n <= ALKANES.length; n++) {
    const alkane = ALKANES[n - 1];
    const stem = alkane.slice(0, -3);
    yield { smiles: "C".repeat(n), names: [alkane, `n-${alkane}`], radical: `[CH2]${"C".repeat(n - 1)}`, radicalName: `${stem}yl` };
  }
  for (let n = 1; n <= ALKANES.length; n++) {
    const alkane = ALKANES[n - 1];
    for (const [prefix, branch, bonds] of SUBSTITUENTS) {
      for (let p = 0; p < Math.ceil(n / 2); p++) {
        if (prefix === "oxo" && (n < 3 || p === 0)) continue;
        yield* named(n, alkane, [[p, [prefix, branch, bonds]]]);
        for (const [prefix2, branch2, bonds2] of SUBSTITUENTS.slice(0, 6)) {
          for (let q = p + 1; q < n - 1; q++) {
            if (prefix2 === "oxo") continue;
            yield* named(n, alkane, [
              [p, [prefix, branch, bonds]],
              [q, [prefix2, branch2, bonds2]],
            ]);
          }
        }
      }
    }
  }
}

function* named(n: number, alkane: string, placed: [number, [string, string, number]][]): Generator<SpeciesSeed> {
  const subs = new Map<number, [string, string, number][]>();
  for (const [pos, sub] of placed) subs.set(pos, [...(subs.get(pos) ?? []), sub]);
  const smiles = chainSmiles(n, subs, null);
  if (!smiles) return;
  const parts = [...placed].sort((a, b) => a[1][0].localeCompare(b[1][0]));
  const name = parts.map(([pos, [prefix]]) => `${pos + 1}-${prefix}`).join("-") + alkane;
  const names = [name];
  if (placed.length === 1 && placed[0][1][0] === "hydroxy") names.push(`${alkane.slice(0, -1)}-${placed[0][0] + 1}-ol`);
  if (placed.length === 1 && placed[0][1][0] === "chloro") names.push(`${alkane.slice(0, -3)}yl chloride (${placed[0][0] + 1})`);
  const radical = n > 1 && !subs.has(n - 1) ? chainSmiles(n, subs, n - 1) : null;
  yield { smiles, names, ...(radical ? { radical, radicalName: `${name.slice(0, -3)}yl` } : {}) };
}

// ---------------------------------------------------------------------------------------------
// Reactions

export interface BenchSpecies {
  id: number;
  inchiKey: string;
  inchi: string;
  formula: string;
  smiles: string;
  molarMass: number;
  radicalElectrons: number;
  names: string[];
  elements: Record<string, number>;
  charge: number;
}

export interface BenchReaction {
  id: number;
  key: string;
  equation: string;
  reactants: BenchSpecies[];
  products: BenchSpecies[];
  productsUnknown: boolean;
  reactionClass: ReactionClassId;
  order: 1 | 2;
  /** The invented "true" expression the datasets scatter around, canonical units (K, J mol⁻¹). */
  lnA: number;
  n: number;
  ea: number;
}

export const PRODUCTS_UNKNOWN_REASON = "Only the loss of the reactant was followed.";

// ---------------------------------------------------------------------------------------------
// People, words, places

const GIVEN = [
  "Ada",
  "Bo",
  "Cai",
  "Dara",
  "Eli",
  "Femi",
  "Greta",
  "Hana",
  "Ilya",
  "Jun",
  "Kira",
  "Lev",
  "Mina",
  "Nils",
  "Oona",
  "Pau",
  "Quinn",
  "Rhea",
  "Sami",
  "Tove",
  "Uma",
  "Vero",
  "Wen",
  "Xan",
  "Yara",
  "Zeno",
];
const SYLLABLES = [
  "ka",
  "lo",
  "mer",
  "sen",
  "tar",
  "vik",
  "hol",
  "dra",
  "ben",
  "sto",
  "rin",
  "mak",
  "fel",
  "gor",
  "nes",
  "pri",
  "qui",
  "wal",
  "zet",
  "yor",
  "lund",
  "berg",
  "ova",
  "ito",
  "ez",
  "son",
];
const PLACES = [
  "Norvale",
  "Easthaven",
  "Kestrel Bay",
  "Lindmark",
  "Port Amsel",
  "Saltcombe",
  "Vireo",
  "Tallowfield",
  "Brackenridge",
  "Oskarholm",
];
const INSTITUTES = [
  "Institute of Physical Chemistry",
  "Department of Chemistry",
  "Combustion Laboratory",
  "Atmospheric Research Centre",
  "School of Chemical Sciences",
  "Reaction Dynamics Group",
];
const JOURNALS = [
  "Journal of Invented Kinetics",
  "Letters in Imaginary Physical Chemistry",
  "Annals of Synthetic Reaction Rates",
  "Transactions of Example Chemistry",
  "Review of Placeholder Combustion",
];
const KEYWORDS = [
  "atmospheric chemistry",
  "combustion",
  "halocarbons",
  "radical kinetics",
  "temperature dependence",
  "pressure dependence",
  "tropospheric oxidation",
  "ignition",
  "pyrolysis",
  "ab initio",
  "relative rates",
  "flame chemistry",
  "aerosol precursors",
  "ozone depletion",
];

export function personName(r: Random): string {
  const family = Array.from({ length: r.int(2, 3) }, () => r.pick(SYLLABLES)).join("");
  return `${family[0].toUpperCase()}${family.slice(1)}, ${r.pick(GIVEN)}`;
}

/** An ORCID iD with a right ISO 7064 MOD 11-2 check character (ORCID's documented algorithm). */
export function orcidFor(n: number): string {
  const digits = String(1e14 + (n % 1e14))
    .slice(1)
    .padStart(15, "0");
  let total = 0;
  for (const d of digits) total = (total + Number(d)) * 2;
  const check = (12 - (total % 11)) % 11;
  const all = digits + (check === 10 ? "X" : String(check));
  return `${all.slice(0, 4)}-${all.slice(4, 8)}-${all.slice(8, 12)}-${all.slice(12)}`;
}

export interface Person {
  name: string;
  orcid?: string;
  affiliation: string;
}

export function makePeople(r: Random, count: number): Person[] {
  return Array.from({ length: count }, (_, i) => ({
    name: personName(r),
    ...(r.chance(0.4) ? { orcid: orcidFor(i * 7919 + 1) } : {}),
    affiliation: `${r.pick(INSTITUTES)}, ${r.pick(PLACES)}`,
  }));
}

// ---------------------------------------------------------------------------------------------
// Documents

// The technique suggestions of the deposit vocabulary: the first ten are laboratory methods, the next four calculations.
const EXPERIMENT = TECHNIQUE_SUGGESTIONS.slice(0, 10);
const THEORY = TECHNIQUE_SUGGESTIONS.slice(10, 14);
const DETECTION = [
  "laser-induced fluorescence",
  "resonance fluorescence",
  "mass spectrometry",
  "UV absorption",
  "FTIR spectroscopy",
  "cavity ring-down spectroscopy",
  "gas chromatography",
];
const BATH = ["He", "N2", "Ar", "air", "O2", "SF6"];

const weightedLicences = LICENCES.map((l, i) => [l.id, i === 0 ? 50 : i === 1 ? 20 : 30 / (LICENCES.length - 2)] as const);

export interface DocumentPlan {
  document: DepositDocument;
  /** The names the document gives its species, by species id (what the version keeps). */
  participantNames: { speciesId: number; name: string }[];
}

function roundTo(x: number, digits: number): number {
  return Number(x.toPrecision(digits));
}

/** How many points: mostly 4–15, a tail to a few hundred, averaging about ten. */
export function pointCount(r: Random): number {
  const u = r.next();
  if (u < 0.05) return r.int(2, 3);
  if (u < 0.93) return r.int(4, 14);
  if (u < 0.995) return r.int(15, 40);
  return r.int(41, 300);
}

/** One deposit document for `reaction`, with invented people and numbers scattered around the reaction's own expression. */
export function makeDocument(r: Random, reaction: BenchReaction, people: Person[], serial: number, variant = 0): DocumentPlan {
  const category = r.weighted([
    ["experiment", 75],
    ["theory", 18],
    ["evaluation", 7],
  ] as const);
  const technique =
    category === "experiment" ? r.pick(EXPERIMENT) : category === "theory" ? r.pick(THEORY) : "critical evaluation of published data";
  const phase =
    reaction.reactionClass === "electron-transfer"
      ? "liquid"
      : r.weighted([
          ["gas", 86],
          ["liquid", 11],
          ["surface", 3],
        ] as const);
  const hot = reaction.order === 1 || technique === "shock tube";
  const tMin = roundTo(hot ? r.uniform(600, 1400) : r.uniform(190, 420), 3);
  const span = hot ? r.uniform(100, 1200) : category === "theory" ? r.uniform(300, 2500) : r.uniform(20, 500);
  const tMax = roundTo(tMin + span, 3);
  const n = pointCount(r);
  const kUnit = reaction.order === 1 ? "s-1" : r.chance(0.85) ? "cm3 molecule-1 s-1" : "L mol-1 s-1";
  const toUnit = reaction.order === 1 || kUnit === "cm3 molecule-1 s-1" ? 1 : 6.02214076e20; // L mol⁻¹ s⁻¹ per cm³ molecule⁻¹ s⁻¹
  const bias = 0.15 * r.normal();
  const scatter = r.uniform(0.02, 0.15);
  const curved = r.chance(0.15) ? r.uniform(1, 3) : 0;
  const unitSlip = r.chance(0.005) ? 1e3 : 1;
  const outlierAt = r.chance(0.06) && n >= 6 ? r.int(0, n - 1) : -1;
  const R = 8.314462618;
  const withUncertainty = r.chance(0.7);
  const points = Array.from({ length: n }, (_, i) => {
    const T = roundTo(n === 1 ? tMin : tMin + ((tMax - tMin) * i) / (n - 1) + (i > 0 && i < n - 1 ? r.uniform(-2, 2) : 0), 5);
    const lnk = reaction.lnA + (reaction.n + curved) * Math.log(T / 298) - reaction.ea / (R * T) + bias + scatter * r.normal();
    const k = roundTo(Math.exp(lnk) * toUnit * unitSlip * (i === outlierAt ? r.pick([4, 0.25]) : 1), 3);
    return withUncertainty ? { T, k, uncertainty: { kind: "relative" as const, value: roundTo(r.uniform(5, 25), 2) } } : { T, k };
  });
  const year = Math.min(2026, Math.round(2026 - Math.abs(r.normal()) * 18));
  const creators = Array.from(
    {
      length: r.weighted([
        [1, 15],
        [2, 30],
        [3, 30],
        [4, 15],
        [6, 10],
      ] as const),
    },
    () => r.pick(people),
  );
  const nameOf = (s: BenchSpecies) => (r.chance(0.8) ? s.names[0] : r.pick(s.names));
  const side = (list: BenchSpecies[]) => list.map((s) => ({ name: nameOf(s), smiles: s.smiles, coefficient: 1 }));
  const reactants = side(reaction.reactants);
  const products = side(reaction.products);
  const words = reaction.equation;
  const title =
    r.pick([
      `Rate constants for ${words} from ${Math.round(tMin)} to ${Math.round(tMax)} K`,
      `Temperature dependence of ${words}`,
      `Kinetics of ${words} by ${technique}`,
      `${words}: ${category === "theory" ? "computed" : "measured"} rate constants (${technique})`,
    ]) + (variant ? " (revised)" : "");
  const bathGas = phase === "gas" ? r.pick(BATH) : undefined;
  const reported = r.chance(0.4) && {
    model: "arrhenius" as const,
    A: roundTo(Math.exp(reaction.lnA + bias) * toUnit * (r.chance(0.05) ? 30 : 1), 3),
    Ea: roundTo(reaction.ea / 1000, 3),
    EaUnit: "kJ mol-1",
    Tmin: tMin,
    Tmax: tMax,
  };
  const document: DepositDocument = {
    title,
    description: [
      `${category === "theory" ? "Rate constants computed" : category === "evaluation" ? "Recommended values" : "Rate constants measured"} for ${words} with ${technique}${
        category === "experiment" ? ` and ${r.pick(DETECTION)}` : ""
      }.`,
      bathGas ? `Bath gas ${bathGas}.` : "",
      `Synthetic benchmark record ${serial}; the numbers are invented.`,
    ]
      .filter(Boolean)
      .join(" "),
    keywords: Array.from(new Set(Array.from({ length: r.int(1, 4) }, () => r.pick(KEYWORDS)))),
    license: r.weighted(weightedLicences),
    creators: [...new Map(creators.map((c) => [c.name, c])).values()],
    reaction: {
      reactants,
      products,
      ...(reaction.productsUnknown ? { productsUnknown: { reason: PRODUCTS_UNKNOWN_REASON } } : {}),
      class: reaction.reactionClass,
      order: reaction.order,
      phase,
      ...(phase === "liquid" ? { solvent: { name: "water", smiles: "O" } } : {}),
      ...(phase === "surface" ? { surface: r.pick(["alumina", "silica", "ice", "soot"]) } : {}),
    },
    method: {
      category,
      technique,
      ...(category === "experiment" ? { detection: r.pick(DETECTION) } : {}),
    },
    ...(phase === "gas"
      ? {
          conditions: {
            pressure: r.chance(0.7) ? { value: roundTo(r.uniform(1, 760), 3) } : { min: 10, max: roundTo(r.uniform(20, 760), 3) },
            bathGas,
          },
        }
      : {}),
    units: { k: kUnit, T: "K", ...(phase === "gas" ? { pressure: "Torr" } : {}) },
    points,
    ...(reported ? { reportedFit: reported } : {}),
    source: {
      doi: `10.5555/bench.${serial}${variant ? `.${variant}` : ""}`,
      reference: {
        type: "article-journal",
        title: `${title} (invented)`,
        author: creators.map((c) => {
          const [family, given] = c.name.split(", ");
          return { family, given };
        }),
        issued: { "date-parts": [[year]] },
        "container-title": r.pick(JOURNALS),
        volume: String(r.int(1, 120)),
        page: `${r.int(1, 900)}-${r.int(901, 1999)}`,
      },
    },
  } as DepositDocument;
  const participantNames = [...reaction.reactants, ...reaction.products].map((s, i) => ({
    speciesId: s.id,
    name: [...reactants, ...products][i].name,
  }));
  return { document, participantNames };
}

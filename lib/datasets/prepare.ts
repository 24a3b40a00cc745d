import "server-only";
import { checkBalance, ChemError, describeSpecies, reactionKey, type SpeciesIdentity } from "@/lib/chem";
import { validateDeposit, normalisePoints, toAnalysisInput, type DepositDocument } from "@/lib/deposits";
import { AppError, type FieldError } from "@/lib/errors";
import { AnalysisError, analyseDataset, type ReactionOrder } from "@/lib/kinetics";
import type { AnalysisSummary, ReactionInput, StoredPoint } from "./queries";

/** Bumped whenever lib/kinetics changes its results; the refit command compares against it. */
export const ENGINE_VERSION = "kinetics-1";

/**
 * Plausible windows of k in canonical units per order (common practice: beyond these a unit
 * mistake is far likelier than chemistry). Outside is a warning, not an error.
 */
export const PLAUSIBLE_K: Record<ReactionOrder, [number, number, string]> = {
  1: [1e-12, 1e17, "s⁻¹"],
  2: [1e-30, 1e-5, "cm³ molecule⁻¹ s⁻¹"],
  3: [1e-45, 1e-25, "cm⁶ molecule⁻² s⁻¹"],
};

export interface PreparedDeposit {
  document: DepositDocument;
  title: string;
  points: StoredPoint[];
  analysis: AnalysisSummary;
  reaction: ReactionInput;
}

function invalid(message: string, errors: FieldError[]): AppError {
  return new AppError("validation_failed", message, errors);
}

/**
 * Everything between a deposit document and storage: schema and semantic validation, species
 * identity, balance, units sanity, the kinetics analysis. Throws a 422 AppError listing every
 * problem with its JSON pointer; nothing is stored by this function.
 */
export async function prepareDepositOrThrow(raw: unknown): Promise<PreparedDeposit> {
  const validation = validateDeposit(raw);
  if (!validation.ok) {
    const n = validation.errors.length;
    throw invalid(`The deposit has ${n} problem${n === 1 ? "" : "s"}; the first: ${validation.errors[0].message}`, validation.errors);
  }
  const doc = validation.value;
  const checks: AnalysisSummary["checks"] = [];

  const participants: ReactionInput["participants"] = [];
  const sides = [
    ["reactants", "reactant"],
    ["products", "product"],
  ] as const;
  const speciesErrors: FieldError[] = [];
  for (const [field, side] of sides) {
    for (let i = 0; i < doc.reaction[field].length; i++) {
      const sp = doc.reaction[field][i];
      try {
        const identity: SpeciesIdentity = await describeSpecies({ smiles: sp.smiles, inchi: sp.inchi });
        participants.push({ identity, name: sp.name, coefficient: sp.coefficient ?? 1, side });
      } catch (err) {
        if (!(err instanceof ChemError)) throw err;
        const leaf = err.field === "inchi" ? "inchi" : sp.smiles !== undefined ? "smiles" : "inchi";
        speciesErrors.push({ pointer: `/reaction/${field}/${i}/${leaf}`, message: err.message, value: leaf === "smiles" ? sp.smiles : sp.inchi });
      }
    }
  }
  if (speciesErrors.length) throw invalid(speciesErrors[0].message, speciesErrors);

  const reactants = participants.filter((p) => p.side === "reactant");
  const products = participants.filter((p) => p.side === "product");
  const toKeyed = (ps: typeof participants) => ps.map((p) => ({ inchiKey: p.identity.inchiKey, coefficient: p.coefficient }));
  const key = reactionKey({ reactants: toKeyed(reactants), products: toKeyed(products) });
  const label = (p: (typeof participants)[number]) => `${p.coefficient !== 1 ? `${p.coefficient} ` : ""}${p.name ?? p.identity.formula}`;
  const equation = `${reactants.map(label).join(" + ")} → ${products.length ? products.map(label).join(" + ") : "products"}`;

  if (!doc.reaction.productsUnknown) {
    const toBalanced = (ps: typeof participants) => ps.map((p) => ({ elements: p.identity.elements, charge: p.identity.charge, coefficient: p.coefficient }));
    const balance = checkBalance({ reactants: toBalanced(reactants), products: toBalanced(products) });
    checks.push(balance.balanced ? { code: "balanced", severity: "info", message: "Elements and charge balance." } : { code: "unbalanced", severity: "error", message: balance.message });
  } else {
    checks.push({ code: "products_unknown", severity: "info", message: `Products not identified (overall removal rate): ${doc.reaction.productsUnknown.reason}` });
  }

  const normalised = normalisePoints(doc);
  const [lo, hi, unit] = PLAUSIBLE_K[doc.reaction.order];
  const outside = normalised.map((p, i) => (p.k < lo || p.k > hi ? i : -1)).filter((i) => i >= 0);
  if (outside.length) {
    checks.push({
      code: "implausible_magnitude",
      severity: "warn",
      message: `${outside.length} point${outside.length === 1 ? "" : "s"} lie outside ${lo.toExponential(0)}–${hi.toExponential(0)} ${unit}, the usual range for order ${doc.reaction.order}; check the unit of k.`,
    });
  }

  let result: Record<string, unknown>;
  try {
    result = analyseDataset(toAnalysisInput(doc)) as unknown as Record<string, unknown>;
  } catch (err) {
    if (err instanceof AnalysisError) {
      throw invalid(err.message, [{ pointer: err.pointIndex !== undefined ? `/points/${err.pointIndex}` : "/points", message: err.message }]);
    }
    throw err;
  }

  const points: StoredPoint[] = normalised.map((p) => ({ T: p.T, k: p.k, sigmaLnK: p.sigmaLnK, pressurePa: p.pressurePa, bathGas: p.bathGas, note: p.note, original: p.original }));
  return { document: doc, title: doc.title, points, analysis: { engineVersion: ENGINE_VERSION, result, checks }, reaction: { key, equation, participants } };
}

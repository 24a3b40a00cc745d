import "server-only";
import { checkBalance, ChemError, describeSpecies, reactionKey, type SpeciesIdentity } from "@/lib/chem";
import { parseDepositJson, type DepositDocument } from "@/lib/deposits";
import { AppError, type FieldError } from "@/lib/errors";
import { runAnalysisTask } from "@/lib/workers/pool";
import { storedPointsFromColumns } from "./prepare-document";
import type { AnalysisSummary, ReactionInput, StoredPoint } from "./queries";

/** Bumped whenever lib/kinetics changes its results; the refit command compares against it. */
export const ENGINE_VERSION = "kinetics-8";

export { PLAUSIBLE_K } from "./prepare-document";

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
  // The document goes as JSON text: copying a parsed document to the worker would block this thread
  // longer than the validation it spares.
  return prepareOrThrow(JSON.stringify(raw ?? null), raw);
}

/**
 * prepareDepositOrThrow for a document still in its JSON text, as a request body brings it: the
 * text is parsed on the worker, and on this thread only once it has passed, so a large refused
 * document costs the request thread nothing but the copy. Malformed JSON is a 422 too.
 */
export async function prepareDepositTextOrThrow(text: string): Promise<PreparedDeposit> {
  return prepareOrThrow(text);
}

/**
 * prepareDepositTextOrThrow for the UTF-8 bytes of a request body: even decoding 1.7 MB takes the
 * request thread milliseconds, and ten such bodies at once add up, so the bytes are moved to the
 * worker (not copied, when they own their buffer) and decoded there. `bytes` is unusable afterwards.
 */
export async function prepareDepositBytesOrThrow(bytes: Uint8Array): Promise<PreparedDeposit> {
  // Only a view over a whole buffer of its own may be moved (a small body may share Node's pool).
  const owned = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer;
  return prepareOrThrow(bytes, undefined, owned ? [bytes.buffer as ArrayBuffer] : undefined);
}

async function prepareOrThrow(source: string | Uint8Array, parsed?: unknown, transfer?: ArrayBuffer[]): Promise<PreparedDeposit> {
  const checked = await runAnalysisTask("checkDocument", source, { transfer });
  const text = typeof source === "string" ? source : ((checked.ok ? checked.text : undefined) ?? "");
  if (!checked.ok) {
    const n = checked.errors.length;
    if (checked.syntax) throw invalid(checked.errors[0].message, checked.errors);
    throw invalid(`The deposit has ${n} problem${n === 1 ? "" : "s"}; the first: ${checked.errors[0].message}`, checked.errors);
  }
  let raw = parsed;
  if (raw === undefined) {
    const reparsed = parseDepositJson(text, { checkDuplicateKeys: false }); // the worker checked them
    if (!reparsed.ok) throw invalid(reparsed.errors[0].message, reparsed.errors); // cannot happen: the worker parsed it
    raw = reparsed.value;
  }
  // Valid, so `raw` is a deposit document; the same shallow copy validateDeposit returns.
  const doc: DepositDocument = { ...(raw as DepositDocument), license: checked.license };
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
        speciesErrors.push({
          pointer: `/reaction/${field}/${i}/${leaf}`,
          message: err.message,
          value: leaf === "smiles" ? sp.smiles : sp.inchi,
        });
      }
    }
  }
  if (speciesErrors.length) throw invalid(speciesErrors[0].message, speciesErrors);

  const reactants = participants.filter((p) => p.side === "reactant");
  const products = participants.filter((p) => p.side === "product");
  const toKeyed = (ps: typeof participants) => ps.map((p) => ({ inchiKey: p.identity.inchiKey, coefficient: p.coefficient }));
  const key = reactionKey(
    { reactants: toKeyed(reactants), products: toKeyed(products) },
    { productsUnknown: Boolean(doc.reaction.productsUnknown) },
  );
  const label = (p: (typeof participants)[number]) => `${p.coefficient !== 1 ? `${p.coefficient} ` : ""}${p.name ?? p.identity.formula}`;
  const equation = `${reactants.map(label).join(" + ")} → ${products.length ? products.map(label).join(" + ") : "products"}`;

  if (!doc.reaction.productsUnknown) {
    const toBalanced = (ps: typeof participants) =>
      ps.map((p) => ({ elements: p.identity.elements, charge: p.identity.charge, coefficient: p.coefficient }));
    const balance = checkBalance({ reactants: toBalanced(reactants), products: toBalanced(products) });
    checks.push(
      balance.balanced
        ? { code: "balanced", severity: "info", message: "Balanced: elements and charge." }
        : { code: "unbalanced", severity: "error", message: balance.message },
    );
  } else {
    checks.push({
      code: "products_unknown",
      severity: "info",
      message: `Products not identified (overall removal rate): ${doc.reaction.productsUnknown.reason}`,
    });
  }

  checks.push(...checked.checks);
  if (!checked.analysis.ok) throw invalid(checked.analysis.message, checked.analysis.errors);

  return {
    document: doc,
    title: doc.title,
    points: storedPointsFromColumns(doc, checked.columns),
    analysis: { engineVersion: ENGINE_VERSION, result: checked.analysis.result, checks },
    reaction: { key, equation, participants },
  };
}

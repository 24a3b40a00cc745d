/**
 * Loading RDKit MinimalLib (WebAssembly) once per process, and reading SMILES with it.
 */
import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { pathToFileURL } from "node:url";
import initRdkitModule, { type Log, type MainModule, type Mol } from "@rdkit/rdkit";
import { ChemError } from "./chem-error";

/** The RDKit MinimalLib module as its own type declarations describe it. */
export type Rdkit = MainModule;

interface Toolkit {
  rdkit: Rdkit;
  /** Captures RDKit's error channel so a parse failure can be explained to the user. */
  errorLog: Log | null;
}

// A symbol on globalThis survives Next's dev-mode module reloads, so the 7 MB module is
// instantiated once per process rather than once per edit.
const CACHE_KEY = Symbol.for("arrhenia.chem.rdkit");
type ToolkitCache = { [CACHE_KEY]?: Promise<Toolkit> };

/**
 * Finds RDKit_minimal.wasm beside the package's JavaScript. Resolving from this file first and
 * from the working directory second works under tsx, vitest and the Next server alike.
 */
function findWasmFile(): string | undefined {
  const bases = [import.meta.url, pathToFileURL(path.join(process.cwd(), "package.json")).href];
  for (const base of bases) {
    try {
      const entry = createRequire(base).resolve("@rdkit/rdkit");
      const wasm = path.join(path.dirname(entry), "RDKit_minimal.wasm");
      if (existsSync(wasm)) return wasm;
    } catch {
      // Not resolvable from this base (e.g. a bundled chunk); try the next one.
    }
  }
  return undefined;
}

async function loadToolkit(): Promise<Toolkit> {
  const wasm = findWasmFile();
  const rdkit = await initRdkitModule({
    // Without a path RDKit falls back to its own script folder, which is right when unbundled.
    locateFile: (file: string, scriptDirectory: string) => (file.endsWith(".wasm") && wasm ? wasm : scriptDirectory + file),
  });
  // Warnings such as "not removing hydrogen atom without neighbors" are noise on a server.
  rdkit.disable_logging("rdApp.warning");
  const errorLog = rdkit.set_log_capture("rdApp.error");
  return { rdkit, errorLog };
}

async function getToolkit(): Promise<Toolkit> {
  const cache = globalThis as ToolkitCache;
  let pending = cache[CACHE_KEY];
  if (!pending) {
    pending = loadToolkit().catch((cause: unknown) => {
      delete cache[CACHE_KEY]; // let a later call retry instead of caching the failure
      const reason = cause instanceof Error ? cause.message : String(cause);
      throw new ChemError("toolkit_unavailable", `The chemistry toolkit (RDKit) could not be loaded: ${reason}`);
    });
    cache[CACHE_KEY] = pending;
  }
  return pending;
}

/**
 * After a WebAssembly trap (a structure that overruns RDKit's memory or stack: "memory access out of bounds") the
 * instance's state cannot be trusted — every later call may fail — so it is dropped and the next call loads a fresh
 * one. Returns the error to throw instead: a ChemError naming the input.
 */
export function discardToolkitAfterTrap(err: unknown, what: string, field: "smiles" | "inchi"): unknown {
  if (!(err instanceof WebAssembly.RuntimeError)) return err;
  delete (globalThis as ToolkitCache)[CACHE_KEY];
  console.error(`[chem] RDKit trapped on ${what}; a fresh instance will be loaded`, err.message);
  return new ChemError(
    field === "smiles" ? "invalid_smiles" : "invalid_inchi",
    `Could not read ${what} (the structure is beyond what the chemistry toolkit can read)`,
    field,
  );
}

/**
 * RDKit MinimalLib, loaded on first use (≈0.3–0.6 s) and shared by every later call in the
 * process. Example: `const rdkit = await getRdkit(); rdkit.version()`.
 */
export async function getRdkit(): Promise<Rdkit> {
  return (await getToolkit()).rdkit;
}

/** Longest SMILES accepted, in characters; far beyond any species in a rate study. */
export const MAX_SMILES_LENGTH = 1000;

/** Shortens user text for an error message. */
export function quoteInput(text: string, max = 80): string {
  return `"${text.length > max ? `${text.slice(0, max)}…` : text}"`;
}

/** Turns RDKit's logged parse error into a short reason for the person who typed the SMILES. */
export function explainSmilesError(logText: string): string {
  const lines = logText
    .split("\n")
    .map((line) => line.replace(/^\[\d{2}:\d{2}:\d{2}\]\s*/, "").trim())
    .filter(Boolean);
  const all = lines.join("\n");
  if (/unclosed ring/i.test(all)) return "unclosed ring?";
  if (/extra open parenthes/i.test(all)) return "unclosed parenthesis?";
  if (/extra close parenthes/i.test(all)) return "closing parenthesis without an opening one?";
  if (/can't kekulize/i.test(all)) return "aromatic ring that cannot be given alternating bonds; check lowercase atoms and [nH]";
  const valence = /Explicit valence for atom # (\d+) ([A-Za-z]+), (\d+), is greater than permitted/.exec(all);
  if (valence) return `atom ${Number(valence[1]) + 1} (${valence[2]}) has valence ${valence[3]}, more than it allows`;
  const position = /check for mistakes around position (\d+)/.exec(all);
  if (position) return `syntax error near character ${position[1]}`;
  const first = lines[0]?.replace(/^SMILES Parse Error:\s*/i, "").replace(/ for input:.*$/, "");
  return first ? first.slice(0, 120) : "not a valid SMILES";
}

/**
 * Parses one SMILES into an RDKit molecule, or throws a {@link ChemError} naming the reason.
 * The caller owns the returned molecule and must call `mol.delete()`.
 */
export async function parseSmilesOrThrow(smiles: string): Promise<Mol> {
  const text = smiles.trim();
  if (!text) throw new ChemError("missing_structure", "The SMILES is empty.", "smiles");
  if (text.startsWith("InChI=")) {
    throw new ChemError(
      "invalid_smiles",
      `Could not read the SMILES ${quoteInput(text)} (this is an InChI; enter it in the InChI field)`,
      "smiles",
    );
  }
  if (text.length > MAX_SMILES_LENGTH) {
    throw new ChemError(
      "invalid_smiles",
      `Could not read the SMILES ${quoteInput(text)} (longer than ${MAX_SMILES_LENGTH} characters)`,
      "smiles",
    );
  }
  // RDKit would silently read text after a space or line break as a name or CXSMILES extension.
  if (/\s/.test(text)) {
    throw new ChemError("invalid_smiles", `Could not read the SMILES ${quoteInput(text)} (contains a space or line break)`, "smiles");
  }
  const { rdkit, errorLog } = await getToolkit();
  // get_mol runs synchronously, so nothing else can write to the log between these calls.
  errorLog?.clear_buffer();
  let mol: Mol | null;
  try {
    mol = rdkit.get_mol(text);
  } catch (err) {
    throw discardToolkitAfterTrap(err, `the SMILES ${quoteInput(text)}`, "smiles");
  }
  const logged = errorLog?.get_buffer() ?? "";
  errorLog?.clear_buffer();
  if (!mol)
    throw new ChemError("invalid_smiles", `Could not read the SMILES ${quoteInput(text)} (${explainSmilesError(logged)})`, "smiles");
  if (!mol.is_valid()) {
    mol.delete();
    throw new ChemError("invalid_smiles", `Could not read the SMILES ${quoteInput(text)} (not a valid structure)`, "smiles");
  }
  return mol;
}

/** Key of an InChI string as RDKit's bundled InChI library computes it ("" when unreadable). */
export async function computeInchiKey(inchi: string): Promise<string> {
  const { rdkit, errorLog } = await getToolkit();
  const key = rdkit.get_inchikey_for_inchi(inchi);
  errorLog?.clear_buffer();
  return key;
}

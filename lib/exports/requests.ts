/**
 * The query parameters of the export endpoints, as zod schemas (the OpenAPI document is generated
 * from these), and the one reader that turns any problem into a 400 naming the parameter. Pure.
 *
 * - GET /api/v1/datasets/:id/versions/:n/parameters and GET /api/v1/reactions/:key/parameters:
 *   format (table | cantera-yaml), k (a rate-constant unit of the reaction's order), energy (kJ mol-1,
 *   kcal mol-1, J mol-1, cal mol-1 or K), fit (preferred | arrhenius | modified_arrhenius, the fit the
 *   YAML carries), names (formula | deposited, how the YAML names species); the reaction's also include, Tmin, Tmax (the consensus choice of the reaction page).
 * - GET /api/v1/datasets/:id/versions/:n/export.json: no parameters.
 * - GET /api/v1/versions/:id/points.csv: bom (1/true: start with a UTF-8 byte order mark).
 * - GET /api/v1/search/export: format (csv | jsonl | json), bom, and every parameter of GET /api/v1/search
 *   but limit and cursor (the whole result is exported).
 */
import { z } from "zod";
import { AppError, type FieldError } from "@/lib/errors";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { parseEnergyUnit, parseRateConstantUnit, UnitError } from "@/lib/kinetics/units";
import { DEFAULT_MECHANISM_ENERGY, MECHANISM_ENERGY_UNITS, mechanismRateUnits, type MechanismUnits } from "./mechanism";
import { SPECIES_NAMINGS } from "./species-names";

export const MECHANISM_FORMATS = ["table", "cantera-yaml"] as const;
export const MECHANISM_FITS = ["preferred", "arrhenius", "modified_arrhenius"] as const;
export const SEARCH_EXPORT_FORMATS = ["csv", "jsonl", "json"] as const;

const flag = (name: string) =>
  z.enum(["1", "0", "true", "false"], { error: `${name} must be 1 or 0 (true or false)` }).transform((v) => v === "1" || v === "true");

/** GET …/versions/:n/parameters. Units are strings here; they are checked against the reaction's order once it is known. */
export const versionParametersQuerySchema = z
  .object({
    format: z.enum(MECHANISM_FORMATS, { error: `format must be one of ${MECHANISM_FORMATS.join(", ")}` }).default("table"),
    k: z.string().trim().min(1, "k must name a rate-constant unit").optional(),
    energy: z.string().trim().min(1, "energy must name an energy unit").optional(),
    fit: z.enum(MECHANISM_FITS, { error: `fit must be one of ${MECHANISM_FITS.join(", ")}` }).default("preferred"),
    names: z
      .enum(SPECIES_NAMINGS, { error: `names must be one of ${SPECIES_NAMINGS.join(", ")}` })
      .default("formula")
      .describe("How the YAML names species: formula (OH, CH4; isomers get part of their InChIKey) or deposited (the depositor's words)."),
  })
  .strict();

/** GET /api/v1/reactions/:key/parameters: the same, and the consensus choice (read by lib/reactions/consensus-selection.ts). */
export const reactionParametersQuerySchema = versionParametersQuerySchema
  .extend({ include: z.string().optional(), Tmin: z.string().optional(), Tmax: z.string().optional() })
  .strict();

/** GET …/versions/:n/export.json: no parameters (an unknown one is a 400, never ignored). */
export const versionExportQuerySchema = z.object({}).strict();

/** GET …/versions/:n/datacite.json and datacite.xml: no parameters (an unknown one is a 400, never ignored). */
export const dataciteQuerySchema = z.object({}).strict();

/** GET /api/v1/versions/:id/points.csv. */
export const pointsCsvQuerySchema = z.object({ bom: flag("bom").default(false) }).strict();

/** GET /api/v1/search/export: its own parameters; the search's are read by lib/search/params.ts. */
export const searchExportQuerySchema = z.object({
  format: z.enum(SEARCH_EXPORT_FORMATS, { error: `format must be one of ${SEARCH_EXPORT_FORMATS.join(", ")}` }).default("csv"),
  bom: flag("bom").default(false),
});

function badRequest(errors: FieldError[]): AppError {
  const title =
    errors.length === 1
      ? errors[0].message
      : `${errors.length} query parameters are not valid (${[...new Set(errors.map((e) => e.parameter))].join(", ")})`;
  return new AppError("bad_request", title, errors);
}

const problem = (parameter: string, message: string): FieldError => ({ pointer: `/${parameter}`, parameter, message });

/**
 * The query read with `schema`, or a 400 naming each parameter at fault (unknown, repeated or bad).
 * `only` limits the parameters read to those names (the rest are somebody else's, as a search's).
 */
export function parseQueryOrThrow<S extends z.ZodType<Record<string, unknown>>>(
  schema: S,
  params: URLSearchParams,
  { only }: { only?: readonly string[] } = {},
): z.output<S> {
  const raw: Record<string, string> = {};
  const errors: FieldError[] = [];
  for (const [name, value] of params) {
    if (only && !only.includes(name)) continue;
    if (name in raw) errors.push(problem(name, `${name} may be given once`));
    raw[name] = value;
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success)
    for (const issue of parsed.error.issues) {
      const names = issue.code === "unrecognized_keys" ? issue.keys : [String(issue.path[0] ?? "")];
      for (const parameter of names)
        errors.push(problem(parameter, issue.code === "unrecognized_keys" ? `unknown parameter “${parameter}”` : issue.message));
    }
  if (errors.length || !parsed.success) throw badRequest(errors);
  return parsed.data;
}

/** The chosen k and energy units for a reaction of `order` (defaults: the canonical k unit, kJ mol⁻¹), or a 400 naming k or energy. */
export function mechanismUnitsOrThrow(order: ReactionOrder, query: { k?: string; energy?: string }): MechanismUnits {
  const errors: FieldError[] = [];
  let kUnit = mechanismRateUnits(order)[0];
  let energyUnit = DEFAULT_MECHANISM_ENERGY;
  if (query.k !== undefined) {
    try {
      kUnit = parseRateConstantUnit(query.k, order).id;
    } catch (e) {
      if (!(e instanceof UnitError)) throw e;
      errors.push(
        problem("k", `k “${query.k}” is not a unit of this order-${order} reaction: use one of ${mechanismRateUnits(order).join(", ")}`),
      );
    }
  }
  if (query.energy !== undefined) {
    const offered = MECHANISM_ENERGY_UNITS.map((u) => u.id) as readonly string[];
    let id: string | null = null;
    try {
      id = parseEnergyUnit(query.energy).id;
    } catch (e) {
      if (!(e instanceof UnitError)) throw e;
    }
    if (id !== null && offered.includes(id)) energyUnit = id;
    else errors.push(problem("energy", `energy “${query.energy}” must be one of ${offered.join(", ")}`));
  }
  if (errors.length) throw badRequest(errors);
  return { kUnit, energyUnit };
}

/** Stable codes of {@link ChemError}; the API maps them to 422 responses. */
export type ChemErrorCode =
  | "missing_structure"
  | "invalid_smiles"
  | "invalid_inchi"
  | "unsupported_species"
  | "identity_mismatch"
  | "invalid_reaction"
  | "invalid_drawing_size"
  | "toolkit_unavailable";

/** The input field a {@link ChemError} is about, so a form can point at it. */
export type ChemErrorField = "smiles" | "inchi" | "reactants" | "products" | "size";

/**
 * A species or reaction that cannot be read or checked. The message is written for the person
 * who typed the structure; `field` names the input it refers to when there is one.
 */
export class ChemError extends Error {
  readonly code: ChemErrorCode;
  readonly field?: ChemErrorField;

  constructor(code: ChemErrorCode, message: string, field?: ChemErrorField) {
    super(message);
    this.name = "ChemError";
    this.code = code;
    if (field !== undefined) this.field = field;
  }
}

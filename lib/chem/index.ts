/**
 * Species identity and reaction balance, on RDKit MinimalLib (WebAssembly). Pure: no database,
 * no network, no framework.
 *
 * Conventions: molar masses in g mol⁻¹ from standard atomic weights; charges in elementary
 * charges; formulas in Hill order with the charge appended ("HO-"); identity by standard InChIKey;
 * reaction keys keep direction (A + B → C differs from C → A + B).
 */
export { ChemError, type ChemErrorCode, type ChemErrorField } from "./chem-error";
export { getRdkit, MAX_SMILES_LENGTH, type Rdkit } from "./load-rdkit";
export { describeSpecies, type SpeciesIdentity, type SpeciesInput } from "./describe-species";
export { reactionKey, type KeyedParticipant, type KeyedReaction } from "./reaction-key";
export { checkBalance, type BalanceParticipant, type BalanceResult } from "./check-balance";
export { renderSpeciesSvg, drawingInMemory, keepDrawingInMemory, DEFAULT_DRAWING_SIZE, type DrawingSize } from "./render-species-svg";
export { formatHillFormula } from "./hill-formula";
export { readInchiComposition, type InchiComposition } from "./read-inchi";
export { STANDARD_ATOMIC_WEIGHTS, NUCLIDE_MASSES } from "./atomic-weights";

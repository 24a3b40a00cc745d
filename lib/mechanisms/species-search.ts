import "server-only";
import { ChemError, describeSpecies } from "@/lib/chem";
import { searchSpeciesForMapping } from "./queries";

/**
 * The mapping table's search: a name or formula as written, an InChIKey, and a SMILES or InChI read by the same
 * species reader as the structure preview, so any way of writing a structure finds its species.
 */
export async function findSpeciesForMapping({ text }: { text: string }) {
  const t = text.trim();
  const inchiKeys: string[] = [];
  const structure = /^InChI=/i.test(t) ? { inchi: t } : /^\S+$/.test(t) ? { smiles: t } : null;
  if (structure) {
    try {
      inchiKeys.push((await describeSpecies(structure)).inchiKey);
    } catch (err) {
      // Most names are no SMILES: nothing to add then.
      if (!(err instanceof ChemError)) throw err;
    }
  }
  return searchSpeciesForMapping({ text: t, inchiKeys });
}

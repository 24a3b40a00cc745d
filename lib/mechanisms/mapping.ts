/**
 * A person's species choices as CSV (download and upload): `name,inchikey` with a header line, one
 * mechanism name a row. Pure; rows are numbered as a spreadsheet shows them (the header is row 1).
 */
import Papa from "papaparse";
import { csvCommentLine, textCell } from "@/lib/datasets/point-export";
import type { SpeciesMatch } from "./match";

export const MAX_MAPPING_ROWS = 10_000;
const INCHIKEY = /^[A-Z]{14}-[A-Z]{10}-[A-Z]$/;

export function speciesMappingCsv(species: readonly SpeciesMatch[], name: string): string {
  const lines = [
    csvCommentLine("species of mechanism check", name),
    "name,inchikey,matched_by,candidates",
    ...species.map((s) =>
      [
        textCell(s.name),
        s.inchiKey ?? "",
        s.by,
        textCell(s.inchiKey ? "" : s.candidates.map((c) => `${c.inchiKey} ${c.name}`).join("; ")),
      ].join(","),
    ),
  ];
  return lines.join("\r\n") + "\r\n";
}

export type MappingRead =
  { ok: true; choices: { name: string; inchiKey: string }[] } | { ok: false; errors: { row: number; column: string; message: string }[] };

/** Reads an uploaded mapping: rows without an InChIKey are skipped (nothing chosen); a malformed one is named by row. */
export function readSpeciesMappingCsv(text: string): MappingRead {
  const parsed = Papa.parse<string[]>(text.replace(/^"#[^\r\n]*/gm, "#"), { comments: "#", skipEmptyLines: true });
  const rows = parsed.data;
  const header = (rows[0] ?? []).map((h) => h.trim().toLowerCase());
  const nameAt = header.indexOf("name");
  const keyAt = header.indexOf("inchikey");
  if (nameAt < 0 || keyAt < 0)
    return { ok: false, errors: [{ row: 1, column: "", message: 'The first row must name the columns "name" and "inchikey".' }] };
  if (rows.length - 1 > MAX_MAPPING_ROWS)
    return { ok: false, errors: [{ row: MAX_MAPPING_ROWS + 2, column: "", message: `At most ${MAX_MAPPING_ROWS} rows.` }] };
  const errors: { row: number; column: string; message: string }[] = [];
  const choices: { name: string; inchiKey: string }[] = [];
  rows.slice(1).forEach((cells, i) => {
    const row = i + 2;
    const name = (cells[nameAt] ?? "").trim().replace(/^'(?=[=+\-@])/, "");
    const key = (cells[keyAt] ?? "").trim().toUpperCase();
    if (!key) return;
    if (!name) errors.push({ row, column: "name", message: `Row ${row}: the name is empty.` });
    else if (!INCHIKEY.test(key))
      errors.push({ row, column: "inchikey", message: `Row ${row}, column "inchikey": "${key.slice(0, 40)}" is not an InChIKey.` });
    else choices.push({ name, inchiKey: key });
  });
  return errors.length ? { ok: false, errors } : { ok: true, choices };
}

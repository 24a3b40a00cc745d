// POST /api/v1/mechanism-checks/species-choices — remember which species a mechanism name stands for (JSON or the mapping CSV);
// DELETE ?name=<name> — forget one remembered choice
import { NextResponse } from "next/server";
import { withApi, zodToFieldErrors } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, parseJsonBytesOrThrow, readBodyOrThrow } from "@/lib/http/read-body";
import { readSpeciesMappingCsv } from "@/lib/mechanisms/mapping";
import { forgetSpeciesChoice, saveSpeciesChoices } from "@/lib/mechanisms/queries";
import { speciesChoicesBodySchema } from "@/lib/mechanisms/request";

export const POST = withApi(
  async ({ req, user }) => {
    const bytes = await readBodyOrThrow(req, { limit: BODY_LIMITS.json, what: "species choices" });
    let choices: { name: string; inchiKey: string }[];
    let rowOf = (i: number) => `/choices/${i}`;
    if ((req.headers.get("content-type") ?? "").toLowerCase().startsWith("text/csv")) {
      const read = readSpeciesMappingCsv(new TextDecoder().decode(bytes));
      if (!read.ok)
        throw new AppError(
          "validation_failed",
          read.errors[0].message,
          read.errors.slice(0, 100).map((e) => ({ pointer: "", message: e.message, value: { row: e.row, column: e.column } })),
        );
      choices = read.choices;
      rowOf = (i: number) => `row ${i + 2}`;
    } else {
      const parsed = speciesChoicesBodySchema.safeParse(parseJsonBytesOrThrow(bytes));
      if (!parsed.success)
        throw new AppError("validation_failed", "The choices do not match the expected shape", zodToFieldErrors(parsed.error));
      choices = parsed.data.choices;
    }
    // One name, one species: a name given twice is named rather than half-saved.
    const seen = new Map<string, number>();
    const twice = choices.flatMap((c, i) => {
      const first = seen.get(c.name);
      seen.set(c.name, first ?? i);
      return first === undefined
        ? []
        : [
            {
              pointer: rowOf(i).startsWith("/") ? `${rowOf(i)}/name` : "",
              message: `${rowOf(i)}: the name “${c.name}” is given again (first at ${rowOf(first)}); give each name once.`,
            },
          ];
    });
    if (twice.length) throw new AppError("validation_failed", twice[0].message, twice.slice(0, 100));
    const { unknown } = await saveSpeciesChoices({ userId: user!.id, choices });
    if (unknown.length) {
      const errors = choices.flatMap((c, i) =>
        unknown.includes(c.inchiKey)
          ? [
              {
                pointer: rowOf(i).startsWith("/") ? `${rowOf(i)}/inchiKey` : "",
                message: `${rowOf(i)}: no species has the InChIKey ${c.inchiKey}.`,
              },
            ]
          : [],
      );
      throw new AppError("validation_failed", errors[0].message, errors.slice(0, 100));
    }
    return NextResponse.json({ data: { saved: choices.length } });
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);

export const DELETE = withApi(
  async ({ req, user }) => {
    const names = new URL(req.url).searchParams.getAll("name");
    if (names.length !== 1 || !names[0].trim() || names[0].length > 200)
      throw new AppError("bad_request", "Name the one mechanism name whose choice to forget", [
        {
          pointer: "/name",
          parameter: "name",
          message: "Required once: the species name as the mechanism writes it (at most 200 characters)",
        },
      ]);
    const forgotten = await forgetSpeciesChoice({ userId: user!.id, name: names[0] });
    if (!forgotten) throw new AppError("not_found", `You have no remembered choice for “${names[0]}”`);
    return NextResponse.json({ data: { forgotten: names[0] } });
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);

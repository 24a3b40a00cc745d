import type { Metadata } from "next";
import { publicPageMetadata } from "@/lib/page-metadata";
import Link from "next/link";
import { describeDepositSchema, type FieldDoc, type SectionDoc } from "@/lib/deposits/describe-schema";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { validateDeposit } from "@/lib/deposits/validate";
import {
  CONFIDENCE_LEVELS,
  DEPOSIT_SCHEMA_ID,
  FIT_MODELS,
  LICENCES,
  MAX_POINTS,
  MIN_POINTS,
  METHOD_CATEGORIES,
  RELATION_TYPES,
  REACTION_CLASSES,
  TECHNIQUE_SUGGESTIONS,
  UNCERTAINTY_KINDS,
} from "@/lib/deposits/vocabulary";
import { SUPPORTED_UNITS, type UnitDefinition } from "@/lib/kinetics";
import { MarkdownText } from "@/components/markdown-text";
import { ScrollRegion } from "@/components/scroll-region";

export async function generateMetadata(): Promise<Metadata> {
  return publicPageMetadata({
    title: "Deposit format",
    description: "The deposit document, field by field: what a dataset of rate constants must and may say, generated from its JSON Schema.",
    path: "/docs/deposit-format",
  });
}

const SCHEMA_PATH = "/schemas/deposit/v1.json";

/** A deliberately broken copy of the example, to show real error messages. */
function sampleErrors() {
  const broken = structuredClone(EXAMPLE_DEPOSIT) as unknown as Record<string, Record<string, unknown> & { [k: string]: unknown }>;
  const points = broken.points as unknown as Record<string, unknown>[];
  points[1] = { ...points[1], k: "2.89e-15x" };
  points[2] = { ...points[2], k: -4.33e-15 };
  broken.units = { ...broken.units, k: "L mol-1" };
  const reaction = { ...broken.reaction };
  delete reaction.order;
  broken.reaction = reaction;
  const result = validateDeposit(broken);
  return result.ok ? [] : result.errors;
}

function FieldRow({ field }: { field: FieldDoc }) {
  return (
    <tr>
      <td className="whitespace-nowrap font-mono text-xs">
        {field.name}
        {field.required && (
          <span className="ml-1 font-sans text-error" title="required">
            *
          </span>
        )}
      </td>
      <td className="text-xs">{field.sectionId ? <a href={`#${field.sectionId}`}>{field.type}</a> : field.type}</td>
      <td>
        <p className="font-medium">{field.title}</p>
        <p className="text-muted">{field.description}</p>
        {field.allowed && (
          <p className="mt-1 text-xs">
            Allowed:{" "}
            {field.allowed.map((a, i) => (
              <span key={a}>
                {i > 0 && ", "}
                <code>{a}</code>
              </span>
            ))}
          </p>
        )}
        {field.default && (
          <p className="mt-1 text-xs">
            Default: <code>{field.default}</code>
          </p>
        )}
        {field.constraints.length > 0 && <p className="mt-1 text-xs text-muted">{field.constraints.join("; ")}</p>}
        {field.examples && <p className="mt-1 text-xs text-muted">For example: {field.examples.map((e) => `“${e}”`).join(", ")}</p>}
      </td>
    </tr>
  );
}

function SchemaSection({ section }: { section: SectionDoc }) {
  return (
    <section aria-labelledby={section.id} className="space-y-2">
      <h3 id={section.id} className="text-lg font-semibold">
        {section.title} <code className="ml-1 font-mono text-sm font-normal text-muted">{section.path || "(top level)"}</code>
      </h3>
      {section.description && <p className="max-w-3xl text-sm text-muted">{section.description}</p>}
      {section.open && <p className="text-xs text-muted">Fields other than those listed are accepted and kept as given.</p>}
      <ScrollRegion label={`Fields of ${section.title}`}>
        <table className="table">
          <thead>
            <tr>
              <th scope="col">Field</th>
              <th scope="col">Type</th>
              <th scope="col">Meaning</th>
            </tr>
          </thead>
          <tbody>
            {section.fields.map((f) => (
              <FieldRow key={f.path} field={f} />
            ))}
          </tbody>
        </table>
      </ScrollRegion>
    </section>
  );
}

function UnitTable({ caption, units }: { caption: string; units: readonly UnitDefinition[] }) {
  return (
    <ScrollRegion label={caption}>
      <table className="table">
        <caption className="py-2 text-left font-semibold">{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Write</th>
            <th scope="col">Means</th>
            <th scope="col">Also accepted</th>
          </tr>
        </thead>
        <tbody>
          {units.map((u) => (
            <tr key={u.id}>
              <td className="font-mono text-xs">{u.id}</td>
              <td>{u.label}</td>
              <td className="font-mono text-xs text-muted">{u.aliases.join(", ") || "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}

function VocabularyTable({ caption, rows }: { caption: string; rows: readonly { id: string; label: string; hint?: string }[] }) {
  return (
    <ScrollRegion label={caption}>
      <table className="table">
        <caption className="py-2 text-left font-semibold">{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Value</th>
            <th scope="col">Shown as</th>
            {rows.some((r) => r.hint) && <th scope="col">Use for</th>}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id}>
              <td className="font-mono text-xs">{r.id}</td>
              <td>{r.label}</td>
              {rows.some((x) => x.hint) && <td className="text-muted">{r.hint}</td>}
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}

export default function DepositFormatPage() {
  const sections = describeDepositSchema();
  const errors = sampleErrors();
  return (
    <div className="space-y-10">
      <header className="space-y-3">
        <h1 className="text-3xl font-semibold">Deposit format</h1>
        <p className="max-w-3xl text-muted">
          A dataset is deposited as one JSON document: who produced the data, the reaction, the method, the conditions, the units, the
          points themselves and where they were published. The editor builds this document for you; scripts can send it to the API directly.
          This page describes version 1, field by field.
        </p>
        <ul className="max-w-3xl list-disc space-y-1 pl-6 text-sm">
          <li>
            JSON Schema (draft 2020-12): <a href={SCHEMA_PATH}>{SCHEMA_PATH}</a>, with <code>$id</code>{" "}
            <code className="break-all">{DEPOSIT_SCHEMA_ID}</code>. Point your editor at it for completion.
          </li>
          <li>
            {MIN_POINTS} to {MAX_POINTS.toLocaleString("en-GB")} points per dataset; files for import (CSV, TSV or JSON) up to 25 MB.
          </li>
          <li>
            Numbers stay as you deposit them; they are converted to K, Pa, J mol⁻¹ and molecule-based rate-constant units only for analysis
            and comparison.
          </li>
        </ul>
        <p className="max-w-3xl rounded-md border border-warn/40 bg-panel p-3 text-sm" role="note">
          Extrapolation outside the measured temperature range is unreliable, and safety-critical use (reactor, storage, process hazards)
          needs qualified review under local codes.
        </p>
      </header>

      <nav aria-labelledby="contents-heading" className="card">
        <h2 id="contents-heading" className="text-xl font-semibold">
          Contents
        </h2>
        <ul className="mt-2 grid gap-1 text-sm sm:grid-cols-2">
          <li>
            <a href="#fields">Fields</a>
          </li>
          <li>
            <a href="#lists">Reaction classes and other lists</a>
          </li>
          <li>
            <a href="#units">Supported units</a>
          </li>
          <li>
            <a href="#errors">How problems are reported</a>
          </li>
          <li>
            <a href="#example">A complete example</a>
          </li>
        </ul>
      </nav>

      <section aria-labelledby="fields" className="space-y-6">
        <h2 id="fields" className="text-2xl font-semibold">
          Fields
        </h2>
        <p className="max-w-3xl text-sm text-muted">
          Fields marked <span className="text-error">*</span> are required. Fields not listed are refused, so a misspelt name is caught
          rather than silently dropped.
        </p>
        <p className="max-w-3xl text-sm text-muted" id="text-rule">
          Text may hold any Unicode character except U+0000 (NUL) and lone surrogates (half of a UTF-16 pair, written <code>\ud800</code> in
          JSON without its partner): the database cannot store them. A document containing one is refused with a pointer to the text (or
          property name) holding it; nothing is removed or replaced silently. The same rule holds for every form and for API query
          parameters.
        </p>
        {sections.map((s) => (
          <SchemaSection key={s.id} section={s} />
        ))}
      </section>

      <section aria-labelledby="lists" className="space-y-6">
        <h2 id="lists" className="text-2xl font-semibold">
          Reaction classes and other lists
        </h2>
        <VocabularyTable caption="Reaction classes (reaction.class)" rows={REACTION_CLASSES} />
        <VocabularyTable caption="Method categories (method.category)" rows={METHOD_CATEGORIES} />
        <div className="space-y-2">
          <h3 className="text-lg font-semibold">Technique suggestions (method.technique)</h3>
          <p className="max-w-3xl text-sm text-muted">Any wording is accepted; these are offered as you type.</p>
          <p className="max-w-3xl text-sm">{TECHNIQUE_SUGGESTIONS.join(" · ")}</p>
        </div>
        <VocabularyTable caption="Uncertainty kinds (points[].uncertainty.kind)" rows={UNCERTAINTY_KINDS} />
        <VocabularyTable caption="Confidence (points[].uncertainty.confidence)" rows={CONFIDENCE_LEVELS} />
        <VocabularyTable caption="Reported fit models (reportedFit.model)" rows={FIT_MODELS} />
        <VocabularyTable caption="Licences (license, SPDX ids)" rows={LICENCES} />
        <VocabularyTable caption="Relation types (relatedIdentifiers[].relation)" rows={RELATION_TYPES} />
      </section>

      <section aria-labelledby="units" className="space-y-4">
        <h2 id="units" className="text-2xl font-semibold">
          Supported units
        </h2>
        <p className="max-w-3xl text-sm text-muted">
          Write exponents as digits (cm3), with a caret (cm^3) or as superscripts (cm³); a dot or an asterisk between factors reads as a
          space. Case matters: M is molar, m is metre. The rate-constant unit must belong to the reaction order.
        </p>
        <div className="grid gap-6 lg:grid-cols-2">
          <UnitTable caption="Rate constants, first order" units={SUPPORTED_UNITS.rateConstant[1]} />
          <UnitTable caption="Rate constants, second order" units={SUPPORTED_UNITS.rateConstant[2]} />
          <UnitTable caption="Rate constants, third order" units={SUPPORTED_UNITS.rateConstant[3]} />
          <UnitTable caption="Temperature" units={SUPPORTED_UNITS.temperature} />
          <UnitTable caption="Pressure" units={SUPPORTED_UNITS.pressure} />
          <UnitTable caption="Activation energy (reportedFit.EaUnit)" units={SUPPORTED_UNITS.energy} />
        </div>
      </section>

      <section aria-labelledby="errors" className="space-y-3">
        <h2 id="errors" className="text-2xl font-semibold">
          How problems are reported
        </h2>
        <p className="max-w-3xl text-sm text-muted">
          Every problem comes with a JSON pointer to the value (<code>/points/2/k</code> is the third point&apos;s rate constant), the value
          itself where there is one, and a sentence saying what to change. The editor shows it beside the field or row; the API answers{" "}
          <code>422</code> with the list under <code>errors</code> in an <code>application/problem+json</code> body. At most 200 problems
          are listed at once. These are the real messages for a copy of the example below with a mistyped number, a negative rate constant,
          a wrong unit and the reaction order left out:
        </p>
        <ScrollRegion label="Example of a refused document and its errors">
          <table className="table">
            <thead>
              <tr>
                <th scope="col">Pointer</th>
                <th scope="col">Message</th>
              </tr>
            </thead>
            <tbody>
              {errors.map((e) => (
                <tr key={e.pointer}>
                  <td className="whitespace-nowrap font-mono text-xs">{e.pointer}</td>
                  <td>{e.message}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      </section>

      <section aria-labelledby="example" className="space-y-3">
        <h2 id="example" className="text-2xl font-semibold">
          A complete example
        </h2>
        <p className="max-w-3xl text-sm text-muted">
          OH + CH₄ → H₂O + CH₃. The people, title, funder, DOI and every number are invented for this page; nothing is taken from a
          publication. Its description renders like this:
        </p>
        <div className="card max-w-3xl">
          <MarkdownText text={EXAMPLE_DEPOSIT.description} />
        </div>
        <pre
          className="max-h-[40rem] overflow-auto rounded-lg border border-line bg-panel p-4 font-mono text-xs"
          tabIndex={0}
          role="region"
          aria-label="Example deposit document (JSON)"
        >
          {JSON.stringify(EXAMPLE_DEPOSIT, null, 2)}
        </pre>
        <p className="text-sm">
          Want to see how a table of your own is fitted before depositing? <Link href="/analyse">Fit your own data</Link>.
        </p>
      </section>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound, permanentRedirect } from "next/navigation";
import { ScrollRegion } from "@/components/scroll-region";
import { SPECIES_PAGE_DRAWING, speciesDrawing } from "@/lib/species/drawings";
import { speciesPath } from "@/lib/identifiers/paths";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { getPublicSpeciesCached, listReactionsOfSpeciesCached } from "@/lib/reactions/cached";
import { reactionPath } from "@/lib/reactions/paths";
import { ChemicalFormula } from "@/components/chemical-formula";
import { readWatchState } from "@/app/watches/watch-control";
import { WatchToggle } from "@/app/watches/watch-forms";

const INCHI_KEY = /^[A-Z]{14}-[A-Z]{10}-[A-Z]$/;

/** The species a path names, or null (malformed key: no lookup; unknown, or only in drafts). */
async function speciesOf(raw: string) {
  const inchiKey = raw.toUpperCase();
  return INCHI_KEY.test(inchiKey) ? getPublicSpeciesCached({ inchiKey }) : null;
}

/** The one name the species is shown by everywhere (lib/reactions/display-names.ts). */
const nameOf = (s: { name: string }) => s.name;

export async function generateMetadata({ params }: { params: Promise<{ inchikey: string }> }): Promise<Metadata> {
  const found = await speciesOf((await params).inchikey);
  if (!found) return NOT_FOUND_METADATA;
  return publicPageMetadata({
    title: `${nameOf(found)} (${found.formula})`,
    description: `${nameOf(found)}, ${found.formula}: structure, identifiers, names, and every reaction with published rate constants it takes part in.`,
    path: speciesPath(found.inchiKey),
  });
}
export const dynamic = "force-dynamic";

/** One species: structure, identity, the names depositors gave it, and its reactions with published data. */
export default async function SpeciesPage({ params }: { params: Promise<{ inchikey: string }> }) {
  const { inchikey } = await params;
  const found = await speciesOf(inchikey);
  if (!found) notFound();
  const watch = await readWatchState({ kind: "species", inchiKey: found.inchiKey });
  // One address per species: a key typed in lower case goes to the upper-case one.
  if (inchikey !== found.inchiKey) permanentRedirect(speciesPath(found.inchiKey));
  const [reactions, picture] = await Promise.all([
    listReactionsOfSpeciesCached({ inchiKey: found.inchiKey }),
    found.smiles ? speciesDrawing(found.smiles, SPECIES_PAGE_DRAWING).catch(() => null) : null,
  ]);
  const name = nameOf(found);
  const synonyms = found.names.filter((n) => n.toLowerCase() !== name.toLowerCase());
  return (
    <article className="space-y-6">
      <header className="space-y-2">
        <p className="text-sm text-muted">Species</p>
        <h1 className="text-3xl font-semibold">{name}</h1>
        <p className="text-sm">
          <ChemicalFormula formula={found.formula} />
          {found.charge !== 0 ? `, charge ${found.charge > 0 ? "+" : "−"}${Math.abs(found.charge)}` : ""}, {found.molarMass.toFixed(3)} g
          mol⁻¹
        </p>
        <WatchToggle
          subject={{ kind: "species", inchiKey: found.inchiKey }}
          what="this species"
          backPath={speciesPath(found.inchiKey)}
          {...watch}
        />
      </header>

      <section className="card flex flex-col gap-6 sm:flex-row" aria-labelledby="identity-heading">
        {picture && (
          // SVG drawn by RDKit on our server from the stored canonical SMILES.
          <div
            role="img"
            aria-label={`Structure of ${name}`}
            className="h-[180px] w-[240px] shrink-0 self-center [&>svg]:h-full [&>svg]:w-full"
            dangerouslySetInnerHTML={{ __html: picture }}
          />
        )}
        <div className="min-w-0 flex-1 space-y-3">
          <h2 id="identity-heading" className="text-xl font-semibold">
            Identity
          </h2>
          <dl className="grid grid-cols-1 gap-x-4 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
            <dt className="text-muted">Formula</dt>
            <dd>
              <ChemicalFormula formula={found.formula} />
            </dd>
            <dt className="text-muted">Molar mass</dt>
            <dd>{found.molarMass.toFixed(3)} g mol⁻¹</dd>
            <dt className="text-muted">InChIKey</dt>
            <dd className="break-all font-mono">{found.inchiKey}</dd>
            <dt className="text-muted">InChI</dt>
            <dd className="break-all font-mono">{found.inchi}</dd>
            <dt className="text-muted">Canonical SMILES</dt>
            <dd className="break-all font-mono">{found.smiles || "—"}</dd>
          </dl>
        </div>
      </section>

      <section className="card space-y-2" aria-labelledby="names-heading">
        <h2 id="names-heading" className="text-xl font-semibold">
          Names
        </h2>
        {found.names.length ? (
          <>
            <p className="text-sm">
              Shown here and in search as <strong>{name}</strong>, the name published datasets use most.
            </p>
            {synonyms.length > 0 && (
              <>
                <p className="text-sm text-muted">
                  Other names (synonyms) depositors gave it, the most used first; each finds it in search.
                </p>
                <ul className="flex flex-wrap gap-2 text-sm" aria-label="Synonyms">
                  {synonyms.map((n) => (
                    <li key={n} className="rounded-md border border-line px-2 py-1">
                      {n}
                    </li>
                  ))}
                </ul>
              </>
            )}
          </>
        ) : (
          <p className="text-sm text-muted">No published dataset names this species; it is shown by its formula.</p>
        )}
      </section>

      <section className="card p-0" aria-labelledby="reactions-heading">
        <h2 id="reactions-heading" className="px-6 pt-5 text-xl font-semibold">
          Reactions
        </h2>
        <p className="px-6 text-sm text-muted">Every reaction with published data that {name} takes part in, as a reactant or a product.</p>
        <ScrollRegion label={`Reactions of ${name}`} className="mt-2">
          <table className="table">
            <thead>
              <tr>
                <th scope="col">Reaction</th>
                <th scope="col">Takes part as</th>
                <th scope="col">Datasets</th>
              </tr>
            </thead>
            <tbody>
              {reactions.map((r) => (
                <tr key={r.id}>
                  <td>
                    <Link href={reactionPath(r.key)}>{r.equation}</Link>
                  </td>
                  <td>{[r.asReactant ? "reactant" : null, r.asProduct ? "product" : null].filter(Boolean).join(" and ")}</td>
                  <td className="whitespace-nowrap">
                    {r.datasets}
                    {r.retracted ? ` (and ${r.retracted} retracted)` : ""}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      </section>
      <p className="text-sm">
        <Link href="/reactions">All reactions</Link>
      </p>
    </article>
  );
}

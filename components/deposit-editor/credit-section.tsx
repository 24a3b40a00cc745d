"use client";

import { IDENTIFIER_KINDS, RELATION_TYPES } from "@/lib/deposits/vocabulary";
import { useEditorContext } from "./editor-context";
import { GroupMessages, Section, SelectField, SubGroup, TextField } from "./fields";
import { blankCreator, blankFunding, blankRelated, type CreatorRow, type FundingRow, type RelatedRow } from "./form-model";
import { sectionAnchor } from "./pointers";
import { removeAt, replaceAt, type SectionProps } from "./section-props";

/** Who made the dataset, who paid for it, and what it links to (the format's creators, funding, relatedIdentifiers). */
export function CreditSection({ form, update }: SectionProps) {
  const { readOnly, clearErrors } = useEditorContext();
  const setCreator = (i: number, patch: Partial<CreatorRow>) =>
    update((f) => ({ ...f, creators: replaceAt(f.creators, i, (c) => ({ ...c, ...patch })) }));
  const setFunding = (i: number, patch: Partial<FundingRow>) =>
    update((f) => ({ ...f, funding: replaceAt(f.funding, i, (x) => ({ ...x, ...patch })) }));
  const setRelated = (i: number, patch: Partial<RelatedRow>) =>
    update((f) => ({ ...f, relatedIdentifiers: replaceAt(f.relatedIdentifiers, i, (r) => ({ ...r, ...patch })) }));
  return (
    <Section
      id={sectionAnchor("credit")}
      title="People, grants and links"
      description="Who is credited for the dataset, who paid for the work, and other records it belongs with."
    >
      <SubGroup legend="People credited">
        <p className="text-sm text-muted">The citation names them in the order given here.</p>
        <GroupMessages pointer="/creators" />
        <ol className="space-y-3">
          {form.creators.map((c, i) => (
            <li key={i} className="grid items-start gap-3 md:grid-cols-[1fr_12rem_1fr_auto]">
              <TextField
                pointer={`/creators/${i}/name`}
                label={`Person ${i + 1}: name`}
                required
                value={c.name}
                onChange={(v) => setCreator(i, { name: v })}
                placeholder="Family, Given"
                autoComplete="name"
              />
              <TextField
                pointer={`/creators/${i}/orcid`}
                label="ORCID iD"
                value={c.orcid}
                onChange={(v) => setCreator(i, { orcid: v })}
                placeholder="0000-0000-0000-0000"
                mono
              />
              <TextField
                pointer={`/creators/${i}/affiliation`}
                label="Affiliation"
                value={c.affiliation}
                onChange={(v) => setCreator(i, { affiliation: v })}
              />
              {!readOnly && form.creators.length > 1 && (
                <button
                  type="button"
                  className="btn-secondary md:mt-6"
                  onClick={() => {
                    clearErrors("/creators");
                    update((f) => ({ ...f, creators: removeAt(f.creators, i) }));
                  }}
                >
                  Remove<span className="sr-only"> person {i + 1}</span>
                </button>
              )}
            </li>
          ))}
        </ol>
        {!readOnly && (
          <button
            type="button"
            className="btn-secondary"
            onClick={() => update((f) => ({ ...f, creators: [...f.creators, blankCreator()] }))}
          >
            Add a person
          </button>
        )}
      </SubGroup>

      <SubGroup legend="Grants">
        {form.funding.length === 0 && <p className="text-sm text-muted">No grant listed; add one if the work was paid for by a grant.</p>}
        <ol className="space-y-3">
          {form.funding.map((x, i) => (
            <li key={i} className="grid items-start gap-3 md:grid-cols-[1fr_10rem_1fr_auto]">
              <TextField
                pointer={`/funding/${i}/funder`}
                label={`Grant ${i + 1}: funder`}
                required
                value={x.funder}
                onChange={(v) => setFunding(i, { funder: v })}
              />
              <TextField
                pointer={`/funding/${i}/awardId`}
                label="Award number"
                value={x.awardId}
                onChange={(v) => setFunding(i, { awardId: v })}
              />
              <TextField
                pointer={`/funding/${i}/awardTitle`}
                label="Award title"
                value={x.awardTitle}
                onChange={(v) => setFunding(i, { awardTitle: v })}
              />
              {!readOnly && (
                <button
                  type="button"
                  className="btn-secondary md:mt-6"
                  onClick={() => {
                    clearErrors("/funding");
                    update((f) => ({ ...f, funding: removeAt(f.funding, i) }));
                  }}
                >
                  Remove<span className="sr-only"> grant {i + 1}</span>
                </button>
              )}
            </li>
          ))}
        </ol>
        {!readOnly && (
          <button
            type="button"
            className="btn-secondary"
            onClick={() => update((f) => ({ ...f, funding: [...f.funding, blankFunding()] }))}
          >
            Add a grant
          </button>
        )}
      </SubGroup>
      <SubGroup legend="Linked records">
        {form.relatedIdentifiers.length === 0 && (
          <p className="text-sm text-muted">None: link a paper, an earlier dataset or software the data depend on.</p>
        )}
        <ol className="space-y-3">
          {form.relatedIdentifiers.map((r, i) => (
            <li key={i} className="grid items-start gap-3 md:grid-cols-[10rem_1fr_12rem_auto]">
              <SelectField
                pointer={`/relatedIdentifiers/${i}/kind`}
                label={`Link ${i + 1}: identifier type`}
                value={r.kind}
                onChange={(v) => setRelated(i, { kind: v as RelatedRow["kind"] })}
                options={IDENTIFIER_KINDS.map((k) => ({ value: k.id, label: k.label }))}
              />
              <TextField
                pointer={`/relatedIdentifiers/${i}/identifier`}
                label={r.kind === "doi" ? "DOI" : "Web address"}
                value={r.identifier}
                onChange={(v) => setRelated(i, { identifier: v })}
                mono
              />
              <SelectField
                pointer={`/relatedIdentifiers/${i}/relation`}
                label="How it relates"
                value={r.relation}
                onChange={(v) => setRelated(i, { relation: v as RelatedRow["relation"] })}
                options={RELATION_TYPES.map((t) => ({ value: t.id, label: t.label }))}
              />
              {!readOnly && (
                <button
                  type="button"
                  className="btn-secondary md:mt-6"
                  onClick={() => {
                    clearErrors("/relatedIdentifiers");
                    update((f) => ({ ...f, relatedIdentifiers: removeAt(f.relatedIdentifiers, i) }));
                  }}
                >
                  Remove<span className="sr-only"> link {i + 1}</span>
                </button>
              )}
            </li>
          ))}
        </ol>
        {!readOnly && (
          <button
            type="button"
            className="btn-secondary"
            onClick={() => update((f) => ({ ...f, relatedIdentifiers: [...f.relatedIdentifiers, blankRelated()] }))}
          >
            Add a link
          </button>
        )}
      </SubGroup>
    </Section>
  );
}

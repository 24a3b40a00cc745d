"use client";

import { IDENTIFIER_KINDS, RELATION_TYPES } from "@/lib/deposits/vocabulary";
import { Section, SelectField, TextField } from "./fields";
import { blankCreator, blankFunding, blankRelated, type RelatedRow } from "./form-model";
import { ListEditor } from "./list-editor";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";

/** Who made the dataset, who paid for it, and what it links to (the format's creators, funding, relatedIdentifiers). */
export function CreditSection({ form, update }: SectionProps) {
  return (
    <Section
      id={sectionAnchor("credit")}
      title="People, grants and links"
      description="Who is credited for the dataset, who paid for the work, and other records it belongs with."
    >
      <ListEditor
        legend="People credited"
        pointer="/creators"
        rows={form.creators}
        updateRows={(change) => update((f) => ({ ...f, creators: change(f.creators) }))}
        blank={blankCreator}
        noun="person"
        addLabel="Add a person"
        intro={<p className="text-sm text-muted">The citation names them in the order given here.</p>}
        minRows={1}
        columns="md:grid-cols-[1fr_12rem_1fr_auto]"
        renderRow={(c, i, set) => (
          <>
            <TextField
              pointer={`/creators/${i}/name`}
              label={`Person ${i + 1}: name`}
              required
              value={c.name}
              onChange={(v) => set({ name: v })}
              placeholder="Family, Given"
              autoComplete="name"
            />
            <TextField
              pointer={`/creators/${i}/orcid`}
              label="ORCID iD"
              value={c.orcid}
              onChange={(v) => set({ orcid: v })}
              placeholder="0000-0000-0000-0000"
              mono
            />
            <TextField
              pointer={`/creators/${i}/affiliation`}
              label="Affiliation"
              value={c.affiliation}
              onChange={(v) => set({ affiliation: v })}
            />
          </>
        )}
      />
      <ListEditor
        legend="Grants"
        pointer="/funding"
        rows={form.funding}
        updateRows={(change) => update((f) => ({ ...f, funding: change(f.funding) }))}
        blank={blankFunding}
        noun="grant"
        addLabel="Add a grant"
        empty={<p className="text-sm text-muted">No grant listed; add one if the work was paid for by a grant.</p>}
        columns="md:grid-cols-[1fr_10rem_1fr_auto]"
        renderRow={(x, i, set) => (
          <>
            <TextField
              pointer={`/funding/${i}/funder`}
              label={`Grant ${i + 1}: funder`}
              required
              value={x.funder}
              onChange={(v) => set({ funder: v })}
            />
            <TextField pointer={`/funding/${i}/awardId`} label="Award number" value={x.awardId} onChange={(v) => set({ awardId: v })} />
            <TextField
              pointer={`/funding/${i}/awardTitle`}
              label="Award title"
              value={x.awardTitle}
              onChange={(v) => set({ awardTitle: v })}
            />
          </>
        )}
      />
      <ListEditor
        legend="Linked records"
        pointer="/relatedIdentifiers"
        rows={form.relatedIdentifiers}
        updateRows={(change) => update((f) => ({ ...f, relatedIdentifiers: change(f.relatedIdentifiers) }))}
        blank={blankRelated}
        noun="link"
        addLabel="Add a link"
        empty={<p className="text-sm text-muted">None: link a paper, an earlier dataset or software the data depend on.</p>}
        columns="md:grid-cols-[10rem_1fr_12rem_auto]"
        renderRow={(r, i, set) => (
          <>
            <SelectField
              pointer={`/relatedIdentifiers/${i}/kind`}
              label={`Link ${i + 1}: identifier type`}
              value={r.kind}
              onChange={(v) => set({ kind: v as RelatedRow["kind"] })}
              options={IDENTIFIER_KINDS.map((k) => ({ value: k.id, label: k.label }))}
            />
            <TextField
              pointer={`/relatedIdentifiers/${i}/identifier`}
              label={r.kind === "doi" ? "DOI" : "Web address"}
              value={r.identifier}
              onChange={(v) => set({ identifier: v })}
              mono
            />
            <SelectField
              pointer={`/relatedIdentifiers/${i}/relation`}
              label="How it relates"
              value={r.relation}
              onChange={(v) => set({ relation: v as RelatedRow["relation"] })}
              options={RELATION_TYPES.map((t) => ({ value: t.id, label: t.label }))}
            />
          </>
        )}
      />
    </Section>
  );
}

"use client";

import { LICENCES } from "@/lib/deposits/vocabulary";
import { useEditorContext } from "./editor-context";
import { GroupMessages, Section, SelectField, SubGroup, TextAreaField, TextField } from "./fields";
import { blankCreator, blankFunding, type CreatorRow, type FundingRow } from "./form-model";
import { sectionAnchor } from "./pointers";
import { removeAt, replaceAt, type SectionProps } from "./section-props";

export function AboutSection({ form, update }: SectionProps) {
  const { readOnly, clearErrors } = useEditorContext();
  const setCreator = (i: number, patch: Partial<CreatorRow>) =>
    update((f) => ({ ...f, creators: replaceAt(f.creators, i, (c) => ({ ...c, ...patch })) }));
  const setFunding = (i: number, patch: Partial<FundingRow>) =>
    update((f) => ({ ...f, funding: replaceAt(f.funding, i, (x) => ({ ...x, ...patch })) }));
  return (
    <Section id={sectionAnchor("about")} title="About the dataset" description="How the dataset will be listed and cited.">
      <TextField
        pointer="/title"
        label="Title"
        required
        value={form.title}
        onChange={(v) => update((f) => ({ ...f, title: v }))}
        hint="3 to 300 characters, as it should appear in search results and citations."
      />
      <TextAreaField
        pointer="/description"
        label="Description"
        required
        rows={6}
        value={form.description}
        onChange={(v) => update((f) => ({ ...f, description: v }))}
        hint="What the data are and how they were obtained. Markdown works: **bold**, *italic*, lists starting with -, [links](https://…)."
      />
      <div className="grid gap-4 md:grid-cols-2">
        <TextField
          pointer="/keywords"
          label="Keywords"
          value={form.keywords}
          onChange={(v) => update((f) => ({ ...f, keywords: v }))}
          hint="Separated by commas, e.g. hydroxyl radical, methane."
        />
        <SelectField
          pointer="/license"
          label="Licence"
          value={form.license}
          onChange={(v) => update((f) => ({ ...f, license: v as typeof f.license }))}
          options={LICENCES.map((l) => ({ value: l.id, label: `${l.label} (${l.id})` }))}
        />
      </div>

      <SubGroup legend="Creators, in citation order">
        <GroupMessages pointer="/creators" />
        <ol className="space-y-3">
          {form.creators.map((c, i) => (
            <li key={i} className="grid items-start gap-3 md:grid-cols-[1fr_12rem_1fr_auto]">
              <TextField
                pointer={`/creators/${i}/name`}
                label={`Creator ${i + 1}: name`}
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
                  Remove<span className="sr-only"> creator {i + 1}</span>
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
            Add a creator
          </button>
        )}
      </SubGroup>

      <SubGroup legend="Funding (optional)">
        {form.funding.length === 0 && <p className="text-sm text-muted">No funding listed.</p>}
        <ol className="space-y-3">
          {form.funding.map((x, i) => (
            <li key={i} className="grid items-start gap-3 md:grid-cols-[1fr_10rem_1fr_auto]">
              <TextField
                pointer={`/funding/${i}/funder`}
                label={`Funder ${i + 1}`}
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
                  Remove<span className="sr-only"> funder {i + 1}</span>
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
            Add funding
          </button>
        )}
      </SubGroup>
    </Section>
  );
}

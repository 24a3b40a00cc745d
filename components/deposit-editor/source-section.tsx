"use client";

import { GroupMessages, NumberField, Section, SelectField, SubGroup, TextField } from "./fields";
import type { EditorForm } from "./form-model";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";

const REFERENCE_TYPES = [
  { value: "article-journal", label: "Journal article" },
  { value: "book", label: "Book" },
  { value: "chapter", label: "Book chapter" },
  { value: "report", label: "Report" },
  { value: "thesis", label: "Thesis" },
  { value: "dataset", label: "Dataset" },
  { value: "paper-conference", label: "Conference paper" },
];

export function SourceSection({ form, update }: SectionProps) {
  const s = form.source;
  const set = (patch: Partial<EditorForm["source"]>) => update((f) => ({ ...f, source: { ...f.source, ...patch } }));
  return (
    <Section id={sectionAnchor("source")} title="Where the numbers were published" description="A DOI, a reference, or both.">
      <div className="grid gap-4 md:grid-cols-2">
        <TextField
          pointer="/source/doi"
          label="DOI of the publication"
          value={s.doi}
          onChange={(v) => set({ doi: v })}
          placeholder="10.5555/example.123"
          mono
          hint="Without https://doi.org/."
        />
        <TextField
          pointer="/source/locator"
          label="Place in the publication"
          value={s.locator}
          onChange={(v) => set({ locator: v })}
          placeholder="e.g. Table 2, or Figure 4 (digitised)"
        />
      </div>
      <SubGroup legend="Reference details (when there is no DOI, or to add to it)">
        <GroupMessages pointer="/source/reference" />
        <div className="grid gap-4 md:grid-cols-[12rem_1fr]">
          <SelectField
            pointer="/source/reference/type"
            label="Published as"
            value={s.refType}
            onChange={(v) => set({ refType: v })}
            options={REFERENCE_TYPES}
          />
          <TextField pointer="/source/reference/title" label="Title" value={s.refTitle} onChange={(v) => set({ refTitle: v })} />
        </div>
        <TextField
          pointer="/source/reference/author"
          label="Authors"
          value={s.refAuthors}
          onChange={(v) => set({ refAuthors: v })}
          placeholder="Family, Given; Family, Given"
          hint="Separate people with semicolons; write each as Family, Given. A name without a comma is kept whole (an organisation)."
        />
        <div className="grid gap-4 md:grid-cols-[1fr_8rem]">
          <TextField
            pointer="/source/reference/container-title"
            label="Journal or book"
            value={s.refJournal}
            onChange={(v) => set({ refJournal: v })}
          />
          <NumberField pointer="/source/reference/issued" label="Year" value={s.refYear} onChange={(v) => set({ refYear: v })} />
        </div>
      </SubGroup>
    </Section>
  );
}

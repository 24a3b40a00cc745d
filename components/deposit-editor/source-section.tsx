"use client";

import { IDENTIFIER_KINDS, RELATION_TYPES } from "@/lib/deposits/vocabulary";
import { useEditorContext } from "./editor-context";
import { GroupMessages, NumberField, Section, SelectField, SubGroup, TextField } from "./fields";
import { blankRelated, type EditorForm, type RelatedRow } from "./form-model";
import { sectionAnchor } from "./pointers";
import { removeAt, replaceAt, type SectionProps } from "./section-props";

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
  const { readOnly, clearErrors } = useEditorContext();
  const s = form.source;
  const set = (patch: Partial<EditorForm["source"]>) => update((f) => ({ ...f, source: { ...f.source, ...patch } }));
  const setRelated = (i: number, patch: Partial<RelatedRow>) =>
    update((f) => ({ ...f, relatedIdentifiers: replaceAt(f.relatedIdentifiers, i, (r) => ({ ...r, ...patch })) }));
  return (
    <Section id={sectionAnchor("source")} title="Source" description="Where the numbers were published: a DOI, a reference, or both.">
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
      <SubGroup legend="Reference (when there is no DOI, or to add details)">
        <GroupMessages pointer="/source/reference" />
        <div className="grid gap-4 md:grid-cols-[12rem_1fr]">
          <SelectField
            pointer="/source/reference/type"
            label="Kind"
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
      <SubGroup legend="Related items (optional)">
        {form.relatedIdentifiers.length === 0 && <p className="text-sm text-muted">None listed.</p>}
        <ol className="space-y-3">
          {form.relatedIdentifiers.map((r, i) => (
            <li key={i} className="grid items-start gap-3 md:grid-cols-[10rem_1fr_12rem_auto]">
              <SelectField
                pointer={`/relatedIdentifiers/${i}/kind`}
                label={`Item ${i + 1}: kind`}
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
                  Remove<span className="sr-only"> item {i + 1}</span>
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
            Add a related item
          </button>
        )}
      </SubGroup>
    </Section>
  );
}

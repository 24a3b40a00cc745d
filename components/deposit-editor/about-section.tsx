"use client";

import { LICENCES } from "@/lib/deposits/vocabulary";
import { Section, SelectField, TextAreaField, TextField } from "./fields";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";

export function AboutSection({ form, update }: SectionProps) {
  return (
    <Section id={sectionAnchor("about")} title="Title and summary" description="How the dataset is listed, found and licensed.">
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
    </Section>
  );
}

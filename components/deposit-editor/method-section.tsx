"use client";

import { METHOD_CATEGORIES, TECHNIQUE_SUGGESTIONS } from "@/lib/deposits/vocabulary";
import { Section, SelectField, TextAreaField, TextField } from "./fields";
import type { EditorForm } from "./form-model";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";

export function MethodSection({ form, update }: SectionProps) {
  const m = form.method;
  const set = (patch: Partial<EditorForm["method"]>) => update((f) => ({ ...f, method: { ...f.method, ...patch } }));
  return (
    <Section
      id={sectionAnchor("method")}
      title="How k was obtained"
      description="Measured, calculated, or evaluated from other work, and by which technique."
    >
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField
          pointer="/method/category"
          label="Obtained by"
          required
          placeholder="Choose…"
          value={m.category}
          onChange={(v) => set({ category: v as EditorForm["method"]["category"] })}
          options={METHOD_CATEGORIES.map((c) => ({ value: c.id, label: c.label }))}
          hint={METHOD_CATEGORIES.find((c) => c.id === m.category)?.hint}
        />
        <div>
          <TextField
            pointer="/method/technique"
            label="Technique"
            required
            list="technique-suggestions"
            value={m.technique}
            onChange={(v) => set({ technique: v })}
            hint="In your own words; common ones are suggested as you type."
          />
          <datalist id="technique-suggestions">
            {TECHNIQUE_SUGGESTIONS.map((t) => (
              <option key={t} value={t} />
            ))}
          </datalist>
        </div>
      </div>
      <TextField
        pointer="/method/detection"
        label="Detection"
        value={m.detection}
        onChange={(v) => set({ detection: v })}
        hint="For experiments: how the species were followed, e.g. laser-induced fluorescence of OH."
      />
      <TextAreaField
        pointer="/method/notes"
        label="Notes on the method"
        value={m.notes}
        onChange={(v) => set({ notes: v })}
        rows={3}
        hint="Level of theory, reference reaction of a relative-rate study, corrections applied…"
      />
    </Section>
  );
}

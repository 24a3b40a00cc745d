"use client";

import { FIT_MODELS } from "@/lib/deposits/vocabulary";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { CheckboxField, GroupMessages, NumberField, Section, SelectField } from "./fields";
import type { EditorForm } from "./form-model";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";

export function ReportedFitSection({ form, update, rangeWarning }: SectionProps & { rangeWarning?: string | null }) {
  const r = form.reportedFit;
  const set = (patch: Partial<EditorForm["reportedFit"]>) => update((f) => ({ ...f, reportedFit: { ...f.reportedFit, ...patch } }));
  const kLabel = SUPPORTED_UNITS.rateConstant[form.reaction.order].find((u) => u.id === form.units.k)?.label ?? form.units.k;
  const TLabel = SUPPORTED_UNITS.temperature.find((u) => u.id === form.units.T)?.label ?? form.units.T;
  const rangeLabel = SUPPORTED_UNITS.temperature.find((u) => u.id === r.rangeUnit)?.label ?? r.rangeUnit;
  const modified = r.model === "modified_arrhenius";
  return (
    <Section
      id={sectionAnchor("fit")}
      title="The authors' expression"
      description="The expression the authors give for their data, if any: k(T) = A · (T / T0)ⁿ · exp(−Ea / RT), with n = 0 in the plain Arrhenius form and T0 = 298.15 K unless given. It is compared with the automatic fit."
    >
      <CheckboxField
        pointer="/reportedFit/enabled"
        label="The authors report an expression for k(T)"
        checked={r.enabled}
        onChange={(v) => set({ enabled: v })}
      />
      {r.enabled && (
        <>
          <GroupMessages pointer="/reportedFit" />
          <SelectField
            pointer="/reportedFit/model"
            label="Form of the expression"
            value={r.model}
            onChange={(v) => set({ model: v as EditorForm["reportedFit"]["model"] })}
            options={FIT_MODELS.map((m) => ({ value: m.id, label: m.label }))}
          />
          <div className="grid gap-4 md:grid-cols-3">
            <NumberField pointer="/reportedFit/A" label={`A (${kLabel})`} required value={r.A} onChange={(v) => set({ A: v })} />
            {modified && <NumberField pointer="/reportedFit/n" label="n" required value={r.n} onChange={(v) => set({ n: v })} />}
            {(modified || r.T0.trim() !== "") && (
              <NumberField
                pointer="/reportedFit/T0"
                label={`T0 (${TLabel})`}
                value={r.T0}
                onChange={(v) => set({ T0: v })}
                hint="298.15 K when left empty."
              />
            )}
          </div>
          <div className="grid gap-4 md:grid-cols-3">
            <NumberField
              pointer="/reportedFit/Ea"
              label="Ea"
              required
              value={r.Ea}
              onChange={(v) => set({ Ea: v })}
              hint="May be negative."
            />
            <SelectField
              pointer="/reportedFit/EaUnit"
              label="Unit of Ea"
              value={r.EaUnit}
              onChange={(v) => set({ EaUnit: v })}
              options={SUPPORTED_UNITS.energy.map((u) => ({ value: u.id, label: u.label }))}
            />
          </div>
          <fieldset className="space-y-2">
            <legend className="text-sm font-medium">Temperatures the authors say it is valid for</legend>
            <div className="grid gap-4 md:grid-cols-3">
              <NumberField
                pointer="/reportedFit/Tmin"
                label={`Valid from (${rangeLabel})`}
                value={r.Tmin}
                onChange={(v) => set({ Tmin: v })}
              />
              <NumberField
                pointer="/reportedFit/Tmax"
                label={`Valid up to (${rangeLabel})`}
                value={r.Tmax}
                onChange={(v) => set({ Tmax: v })}
              />
              <SelectField
                pointer="/reportedFit/rangeUnit"
                label="Unit of the valid range"
                value={r.rangeUnit}
                onChange={(v) => set({ rangeUnit: v })}
                options={SUPPORTED_UNITS.temperature.map((u) => ({ value: u.id, label: u.label }))}
                hint={`Papers usually give it in K; independent of the data's unit (${TLabel}).`}
              />
            </div>
            {rangeWarning && (
              <p id="reported-range-warning" role="status" className="rounded-md border border-warn/60 bg-panel px-3 py-2 text-sm">
                <span className="font-semibold">Check the valid range: </span>
                {rangeWarning}
              </p>
            )}
          </fieldset>
        </>
      )}
    </Section>
  );
}

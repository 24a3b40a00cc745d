"use client";

import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { OTHER_CONDITIONS_LABEL } from "@/lib/deposits/field-labels";
import { GroupMessages, NumberField, Section, SelectField, SubGroup, TextAreaField, TextField } from "./fields";
import type { EditorForm, PressureMode } from "./form-model";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";

export function ConditionsSection({ form, update }: SectionProps) {
  const c = form.conditions;
  const set = (patch: Partial<EditorForm["conditions"]>) => update((f) => ({ ...f, conditions: { ...f.conditions, ...patch } }));
  const pointPressures = form.points.some((p) => p.pressure.trim() !== "");
  return (
    <Section
      id={sectionAnchor("conditions")}
      title="Conditions"
      description="Conditions shared by every point. A pressure or bath gas given on a row of the data overrides these for that row."
    >
      <SubGroup legend="Pressure">
        <SelectField
          pointer="/conditions/pressure/mode"
          label="Pressure of the measurements"
          value={c.pressureMode}
          onChange={(v) => set({ pressureMode: v as PressureMode })}
          options={[
            { value: "none", label: "Not stated" },
            { value: "single", label: "One pressure" },
            { value: "range", label: "A range (lowest to highest)" },
          ]}
        />
        <GroupMessages pointer="/conditions/pressure" />
        <div className="grid gap-4 md:grid-cols-3">
          {c.pressureMode === "single" && (
            <NumberField
              pointer="/conditions/pressure/value"
              label="Pressure"
              required
              value={c.pressure}
              onChange={(v) => set({ pressure: v })}
            />
          )}
          {c.pressureMode === "range" && (
            <>
              <NumberField
                pointer="/conditions/pressure/min"
                label="Lowest pressure"
                required
                value={c.pressureMin}
                onChange={(v) => set({ pressureMin: v })}
              />
              <NumberField
                pointer="/conditions/pressure/max"
                label="Highest pressure"
                required
                value={c.pressureMax}
                onChange={(v) => set({ pressureMax: v })}
              />
            </>
          )}
          {(c.pressureMode !== "none" || pointPressures) && (
            <SelectField
              pointer="/units/pressure"
              label="Pressure unit"
              value={form.units.pressure}
              onChange={(v) => update((f) => ({ ...f, units: { ...f.units, pressure: v } }))}
              options={SUPPORTED_UNITS.pressure.map((u) => ({ value: u.id, label: u.label }))}
              hint={pointPressures ? "Also the unit of the pressures in the data rows." : undefined}
            />
          )}
        </div>
      </SubGroup>
      <TextField
        pointer="/conditions/bathGas"
        label="Bath gas"
        value={c.bathGas}
        onChange={(v) => set({ bathGas: v })}
        hint='A formula or name, e.g. "He", "N2" or "air".'
      />
      <TextAreaField
        pointer="/conditions/notes"
        label={OTHER_CONDITIONS_LABEL}
        value={c.notes}
        onChange={(v) => set({ notes: v })}
        rows={2}
        hint="Concentration ranges, photolysis wavelength, anything else that matters."
      />
    </Section>
  );
}

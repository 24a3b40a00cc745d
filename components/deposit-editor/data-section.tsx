"use client";

import { useState } from "react";
import { CONFIDENCE_LEVELS, UNCERTAINTY_KINDS, type ConfidenceLevel, type UncertaintyKind } from "@/lib/deposits/vocabulary";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { useEditorContext } from "./editor-context";
import { GroupMessages, Section, SelectField } from "./fields";
import type { EditorForm, PointRow } from "./form-model";
import { sectionAnchor } from "./pointers";
import { PointsTable } from "./points-table";
import type { SectionProps } from "./section-props";
import { TableImport } from "./table-import";

/** Unit labels as shown in headers: "cm³ molecule⁻¹ s⁻¹", "K". */
export function unitLabels(form: EditorForm): { k: string; T: string } {
  return {
    k: SUPPORTED_UNITS.rateConstant[form.reaction.order].find((u) => u.id === form.units.k)?.label ?? form.units.k,
    T: SUPPORTED_UNITS.temperature.find((u) => u.id === form.units.T)?.label ?? form.units.T,
  };
}

function ApplyUncertaintyStatement({ update }: Pick<SectionProps, "update">) {
  const [kind, setKind] = useState<UncertaintyKind>("absolute");
  const [confidence, setConfidence] = useState<ConfidenceLevel | "">("");
  return (
    <div className="flex flex-wrap items-end gap-3 text-sm">
      <label className="space-y-1">
        <span className="block font-medium">Every uncertainty is stated as</span>
        <select className="field-input" value={kind} onChange={(e) => setKind(e.target.value as UncertaintyKind)}>
          {UNCERTAINTY_KINDS.map((k) => (
            <option key={k.id} value={k.id}>
              {k.label}
            </option>
          ))}
        </select>
      </label>
      <label className="space-y-1">
        <span className="block font-medium">covering</span>
        <select className="field-input" value={confidence} onChange={(e) => setConfidence(e.target.value as ConfidenceLevel | "")}>
          <option value="">not stated (read as 1σ)</option>
          {CONFIDENCE_LEVELS.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </select>
      </label>
      <button
        type="button"
        className="btn-secondary"
        onClick={() => update((f) => ({ ...f, points: f.points.map((p) => ({ ...p, uKind: kind, uConfidence: confidence })) }))}
      >
        Apply to every row
      </button>
    </div>
  );
}

export function DataSection({
  form,
  update,
  windowStart,
  onWindowStart,
}: SectionProps & { windowStart: number; onWindowStart: (start: number) => void }) {
  const { readOnly, clearErrors } = useEditorContext();
  const labels = unitLabels(form);

  function takeRows(rows: PointRow[], mode: "replace" | "append", units: Partial<EditorForm["units"]>) {
    clearErrors("/points");
    update((f) => ({ ...f, units: { ...f.units, ...units }, points: mode === "append" ? [...f.points, ...rows] : rows }));
    onWindowStart(mode === "append" ? Math.max(0, form.points.length) : 0);
  }

  return (
    <Section
      id={sectionAnchor("data")}
      title="Rate constants"
      description="One row per rate constant: at least two, at most 100 000. Numbers are stored as you give them, in the units chosen here."
    >
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField
          pointer="/units/k"
          label="Unit of k"
          required
          value={form.units.k}
          onChange={(v) => update((f) => ({ ...f, units: { ...f.units, k: v } }))}
          options={SUPPORTED_UNITS.rateConstant[form.reaction.order].map((u) => ({ value: u.id, label: u.label }))}
          hint={`Units for a reaction of order ${form.reaction.order}; change the order under Reaction.`}
        />
        <SelectField
          pointer="/units/T"
          label="Unit of T"
          required
          value={form.units.T}
          onChange={(v) => update((f) => ({ ...f, units: { ...f.units, T: v } }))}
          options={SUPPORTED_UNITS.temperature.map((u) => ({ value: u.id, label: u.label }))}
        />
      </div>
      {!readOnly && <TableImport form={form} onRows={takeRows} />}
      <GroupMessages pointer="/points" />
      <div className="space-y-3">
        <h3 className="text-base font-semibold">
          Rows <span className="font-normal text-muted">({form.points.length.toLocaleString("en")})</span>
        </h3>
        {!readOnly && form.points.length > 1 && <ApplyUncertaintyStatement update={update} />}
        <PointsTable
          form={form}
          update={update}
          windowStart={windowStart}
          onWindowStart={onWindowStart}
          kLabel={labels.k}
          TLabel={labels.T}
        />
      </div>
    </Section>
  );
}

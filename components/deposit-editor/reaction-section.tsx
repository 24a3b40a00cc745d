"use client";

import { PHASES, REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { SUPPORTED_UNITS, getCanonicalRateConstantUnit } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { CheckList } from "./check-list";
import { CheckboxField, NumberField, Section, SelectField, SubGroup, TextField } from "./fields";
import { blankSpecies, type EditorForm, type SpeciesRow } from "./form-model";
import { ListEditor } from "./list-editor";
import { sectionAnchor } from "./pointers";
import type { SectionProps } from "./section-props";
import type { StoredCheck } from "./words";
import { SpeciesPreview } from "./species-preview";

type Side = "reactants" | "products";

/** The reaction as typed, e.g. "OH + CH4 → H2O + CH3", for a quick read-back. */
export function equationText(form: EditorForm): string {
  const label = (s: SpeciesRow) => {
    const who = s.name.trim() || s.smiles.trim() || (s.inchi.trim() ? "(InChI)" : "?");
    const c = s.coefficient.trim();
    return c && c !== "1" ? `${c} ${who}` : who;
  };
  const left = form.reaction.reactants.map(label).join(" + ") || "?";
  const products = form.reaction.products.filter((p) => p.name.trim() || p.smiles.trim() || p.inchi.trim());
  const right =
    form.reaction.productsUnknown && products.length === 0
      ? "products not identified"
      : form.reaction.products.map(label).join(" + ") || "?";
  return `${left} → ${right}`;
}

/** Order changes the dimension of k: keep the unit when it still fits, else take the canonical one. */
export function withOrder(form: EditorForm, order: ReactionOrder): EditorForm {
  const fits = SUPPORTED_UNITS.rateConstant[order].some((u) => u.id === form.units.k);
  return {
    ...form,
    reaction: { ...form.reaction, order },
    units: { ...form.units, k: fits ? form.units.k : getCanonicalRateConstantUnit(order) },
  };
}

function SpeciesList({ side, form, update }: SectionProps & { side: Side }) {
  const noun = side === "reactants" ? "Reactant" : "Product";
  return (
    <ListEditor
      legend={side === "reactants" ? "Reactants" : "Products"}
      pointer={`/reaction/${side}`}
      rows={form.reaction[side]}
      updateRows={(change) => update((f) => ({ ...f, reaction: { ...f.reaction, [side]: change(f.reaction[side]) } }))}
      blank={blankSpecies}
      noun={noun.toLowerCase()}
      addLabel={`Add a ${noun.toLowerCase()}`}
      empty={<p className="text-sm text-muted">None listed.</p>}
      columns="md:grid-cols-[1fr_1fr_1.3fr_5rem_auto]"
      renderRow={(s, i, set) => (
        <>
          <TextField
            pointer={`/reaction/${side}/${i}/name`}
            label={`${noun} ${i + 1}: name`}
            value={s.name}
            onChange={(v) => set({ name: v })}
            placeholder="e.g. hydroxyl radical"
          />
          <TextField
            pointer={`/reaction/${side}/${i}/smiles`}
            label={`${noun} ${i + 1}: SMILES`}
            value={s.smiles}
            onChange={(v) => set({ smiles: v })}
            placeholder="e.g. [OH]"
            mono
          />
          <TextField
            pointer={`/reaction/${side}/${i}/inchi`}
            label={`${noun} ${i + 1}: InChI`}
            value={s.inchi}
            onChange={(v) => set({ inchi: v })}
            placeholder="InChI=1S/…"
            mono
          />
          <NumberField
            pointer={`/reaction/${side}/${i}/coefficient`}
            label={`${noun} ${i + 1}: how many`}
            value={s.coefficient}
            onChange={(v) => set({ coefficient: v })}
          />
        </>
      )}
      renderBelow={(s) => <SpeciesPreview smiles={s.smiles} inchi={s.inchi} />}
    />
  );
}

export function ReactionSection({ form, update, checks }: SectionProps & { checks: StoredCheck[] }) {
  const rx = form.reaction;
  const setRx = (patch: Partial<EditorForm["reaction"]>) => update((f) => ({ ...f, reaction: { ...f.reaction, ...patch } }));
  const classHint = REACTION_CLASSES.find((c) => c.id === rx.class)?.hint;
  return (
    <Section
      id={sectionAnchor("reaction")}
      title="Reaction"
      description="Give each species a SMILES, an InChI or both; they are checked and identified when the draft is saved. Third bodies such as M belong under Conditions, as the bath gas."
    >
      <p className="rounded-md border border-line bg-paper px-3 py-2 font-mono text-sm">
        <span className="sr-only">Reaction as typed: </span>
        {equationText(form)}
      </p>
      <SpeciesList side="reactants" form={form} update={update} />
      <SpeciesList side="products" form={form} update={update} />
      <CheckboxField
        pointer="/reaction/productsUnknown"
        label="The products were not identified (the data describe the overall removal of the reactants)"
        checked={rx.productsUnknown}
        onChange={(v) => setRx({ productsUnknown: v })}
      />
      {rx.productsUnknown && (
        <TextField
          pointer="/reaction/productsUnknown/reason"
          label="Why the products are not given"
          required
          value={rx.productsUnknownReason}
          onChange={(v) => setRx({ productsUnknownReason: v })}
          placeholder="e.g. overall removal of OH measured; products not detected"
        />
      )}
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField
          pointer="/reaction/class"
          label="Reaction class"
          required
          placeholder="Choose a class…"
          value={rx.class}
          onChange={(v) => setRx({ class: v as EditorForm["reaction"]["class"] })}
          options={REACTION_CLASSES.map((c) => ({ value: c.id, label: c.label }))}
          hint={classHint}
        />
        <SelectField
          pointer="/reaction/order"
          label="Reaction order"
          required
          value={String(rx.order)}
          onChange={(v) => update((f) => withOrder(f, Number(v) as ReactionOrder))}
          options={[
            { value: "1", label: "1 (k in s⁻¹)" },
            { value: "2", label: "2 (k in cm³ molecule⁻¹ s⁻¹ or similar)" },
            { value: "3", label: "3 (k in cm⁶ molecule⁻² s⁻¹ or similar)" },
          ]}
        />
        <SelectField
          pointer="/reaction/phase"
          label="Phase"
          required
          value={rx.phase}
          onChange={(v) => setRx({ phase: v as EditorForm["reaction"]["phase"] })}
          options={PHASES.map((p) => ({ value: p.id, label: p.label }))}
        />
      </div>
      {rx.phase === "liquid" && (
        <SubGroup legend="Solvent">
          <div className="grid gap-3 md:grid-cols-3">
            <TextField
              pointer="/reaction/solvent/name"
              label="Solvent name"
              required
              value={rx.solventName}
              onChange={(v) => setRx({ solventName: v })}
              placeholder="e.g. water"
            />
            <TextField
              pointer="/reaction/solvent/smiles"
              label="Solvent SMILES"
              value={rx.solventSmiles}
              onChange={(v) => setRx({ solventSmiles: v })}
              mono
            />
            <TextField
              pointer="/reaction/solvent/inchi"
              label="Solvent InChI"
              value={rx.solventInchi}
              onChange={(v) => setRx({ solventInchi: v })}
              mono
            />
          </div>
        </SubGroup>
      )}
      {rx.phase === "surface" && (
        <TextField
          pointer="/reaction/surface"
          label="Surface"
          value={rx.surface}
          onChange={(v) => setRx({ surface: v })}
          placeholder="e.g. Pt(111) or soot particles"
        />
      )}
      <div className="space-y-2">
        <h3 className="text-sm font-semibold">Identity and balance, as of the last save</h3>
        {checks.length === 0 ? (
          <p className="text-sm text-muted">Save the draft to have each species identified and the elements and charge balanced.</p>
        ) : (
          <CheckList checks={checks} />
        )}
      </div>
    </Section>
  );
}

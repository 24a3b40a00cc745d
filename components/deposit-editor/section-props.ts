import type { EditorForm } from "./form-model";

/** Every section reads the whole form and changes it through one updater. */
export interface SectionProps {
  form: EditorForm;
  update: (change: (form: EditorForm) => EditorForm) => void;
}

/** A copy of `list` with item `index` replaced by `change(item)`. */
export function replaceAt<T>(list: T[], index: number, change: (item: T) => T): T[] {
  return list.map((item, i) => (i === index ? change(item) : item));
}

export function removeAt<T>(list: T[], index: number): T[] {
  return list.filter((_, i) => i !== index);
}

"use client";

import { useId, useState } from "react";

/** The y axis of an Arrhenius plot: natural or decimal logarithm of k. */
export type KScale = "ln" | "log10";

/** ln k → the chosen scale (log₁₀ k = ln k / ln 10). */
export const onKScale = (lnk: number, scale: KScale) => (scale === "ln" ? lnk : lnk / Math.LN10);

/** The axis symbol of the chosen scale. */
export const kScaleSymbol = (scale: KScale) => (scale === "ln" ? "ln k" : "log₁₀ k");

/** A plot's own choice of ln k or log₁₀ k, with the radio pair that changes it. */
export function useKScale(): [KScale, React.ReactNode] {
  const [scale, setScale] = useState<KScale>("ln");
  const name = useId();
  const control = (
    <fieldset className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
      <legend className="sr-only">Rate constant axis</legend>
      <span aria-hidden className="text-muted">
        Axis:
      </span>
      {(["ln", "log10"] as const).map((s) => (
        <label key={s} className="inline-flex items-center gap-1">
          <input type="radio" name={name} value={s} checked={scale === s} onChange={() => setScale(s)} />
          {kScaleSymbol(s)}
        </label>
      ))}
    </fieldset>
  );
  return [scale, control];
}

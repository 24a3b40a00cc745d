/**
 * A Hill formula as a chemist writes it: counts as subscripts, the charge as a superscript
 * ("CH4" → CH₄, "H4N+" → H₄N⁺). The text stays the formula itself, so copying it gives "CH4".
 */
export function ChemicalFormula({ formula }: { formula: string }) {
  const charge = /([+-]\d*)$/.exec(formula);
  const body = charge ? formula.slice(0, charge.index) : formula;
  // Each element symbol with its count: "C", "H4".
  const parts = body.match(/[A-Z][a-z]?\d*|[^A-Z]+/g) ?? [body];
  return (
    <span>
      {parts.map((part, i) => {
        const m = /^([A-Z][a-z]?)(\d+)$/.exec(part);
        return m ? (
          <span key={i}>
            {m[1]}
            <sub>{m[2]}</sub>
          </span>
        ) : (
          <span key={i}>{part}</span>
        );
      })}
      {charge && <sup>{charge[1].length > 1 ? `${charge[1].slice(1)}${charge[1][0]}` : charge[1]}</sup>}
    </span>
  );
}

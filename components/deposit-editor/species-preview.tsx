"use client";

import { useQuery } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import { ChemicalFormula } from "@/components/chemical-formula";

interface Preview {
  formula: string;
  inchiKey: string;
  molarMass: number;
  charge: number;
  radicalElectrons: number | null;
  svg: string | null;
}

/** Structure picture and identity of one species, fetched as the SMILES or InChI settles. */
export function SpeciesPreview({ smiles, inchi }: { smiles: string; inchi: string }) {
  const [settled, setSettled] = useState({ smiles, inchi });
  useEffect(() => {
    const t = setTimeout(() => setSettled({ smiles: smiles.trim(), inchi: inchi.trim() }), 500);
    return () => clearTimeout(t);
  }, [smiles, inchi]);
  const enabled = Boolean(settled.smiles || settled.inchi);
  const query = useQuery<Preview, Error>({
    queryKey: ["species-preview", settled.smiles, settled.inchi],
    enabled,
    retry: false,
    staleTime: Infinity,
    queryFn: async () => {
      const params = new URLSearchParams();
      if (settled.smiles) params.set("smiles", settled.smiles);
      if (settled.inchi) params.set("inchi", settled.inchi);
      const res = await fetch(`/api/v1/species/preview?${params}`);
      const body = await res.json().catch(() => ({}));
      if (!res.ok) throw new Error(body.title ?? `The server answered ${res.status}`);
      return body.data as Preview;
    },
  });
  if (!enabled) return null;
  if (query.isPending) return <p className="text-xs text-muted">Reading the structure…</p>;
  if (query.isError) return <p className="text-xs text-error">{query.error.message}</p>;
  const p = query.data;
  return (
    <div className="flex items-center gap-3 text-xs text-muted">
      {/* The SVG comes from RDKit on our server and carries no script. */}
      {p.svg && (
        <div
          className="h-[90px] w-[120px] shrink-0 overflow-hidden rounded-sm border border-line bg-white [&>svg]:h-full [&>svg]:w-full"
          role="img"
          aria-label={`Structure of ${p.formula}`}
          dangerouslySetInnerHTML={{ __html: p.svg }}
        />
      )}
      <p>
        <span className="font-medium text-ink">
          <ChemicalFormula formula={p.formula} />
        </span>
        , {p.molarMass.toFixed(3)} g mol⁻¹
        {p.radicalElectrons ? `, radical (${p.radicalElectrons} unpaired)` : ""}
        {p.charge ? `, charge ${p.charge > 0 ? "+" : ""}${p.charge}` : ""}
        <br />
        <span className="font-mono">{p.inchiKey}</span>
      </p>
    </div>
  );
}

/**
 * An ORCID iD as every page shows it: the iD linked to its ORCID record, and whether it was
 * proven by signing in at ORCID ("verified") or only typed in ("not verified").
 */
export function OrcidId({ orcid, verified }: { orcid: string; verified: boolean }) {
  return (
    <span className="whitespace-nowrap">
      <a href={`https://orcid.org/${orcid}`} className="font-mono" rel="noopener noreferrer">
        {orcid}
      </a>{" "}
      <span className={verified ? "text-xs font-medium text-ok" : "text-xs text-muted"}>({verified ? "verified" : "not verified"})</span>
    </span>
  );
}

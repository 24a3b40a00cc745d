/** A timestamp in UTC, the same on server and client (no hydration mismatch). */
export function DateTime({ value }: { value: Date | null }) {
  if (!value) return <span className="text-muted">—</span>;
  const iso = value.toISOString();
  return <time dateTime={iso}>{iso.slice(0, 16).replace("T", " ")} UTC</time>;
}

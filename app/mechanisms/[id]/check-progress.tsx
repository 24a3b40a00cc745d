"use client";

import { useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect } from "react";

interface CheckState {
  state: "queued" | "running" | "done" | "failed";
  progress: number;
  total: number;
  progressText: string;
}

/**
 * A queued or running check: asks GET /api/v1/mechanism-checks/:id every second and shows its stage and progress;
 * once it is done or failed the page is rendered again with the report (or the reason).
 */
export function CheckProgress({ id, share, initial }: { id: number; share: string | null; initial: CheckState }) {
  const router = useRouter();
  const query = useQuery({
    queryKey: ["mechanism-check", id, share],
    queryFn: async (): Promise<CheckState> => {
      const res = await fetch(`/api/v1/mechanism-checks/${id}${share ? `?share=${encodeURIComponent(share)}` : ""}`, {
        cache: "no-store",
      });
      if (!res.ok) throw new Error(`The check's state could not be read (HTTP ${res.status}).`);
      const { data } = await res.json();
      return { state: data.state, progress: data.progress, total: data.total, progressText: data.progressText };
    },
    initialData: initial,
    // Nothing kept once the bar is gone: a check run again starts from the state the server rendered, not from the
    // "done" of its previous run.
    gcTime: 0,
    refetchInterval: (q) => (q.state.data && (q.state.data.state === "done" || q.state.data.state === "failed") ? false : 1000),
  });
  const settled = query.data.state === "done" || query.data.state === "failed";
  useEffect(() => {
    if (settled) router.refresh();
  }, [settled, router]);
  const { progress, total, progressText } = query.data;
  return (
    <div className="card space-y-2" data-testid="check-progress">
      <p role="status" aria-live="polite">
        {settled ? "Finished; the report is loading…" : progressText}
      </p>
      <progress
        className="w-full"
        aria-label="Progress of the check"
        value={query.data.state === "queued" ? undefined : progress}
        max={Math.max(1, total)}
      />
      {query.isError && <p className="text-sm text-danger">{(query.error as Error).message} Trying again…</p>}
    </div>
  );
}

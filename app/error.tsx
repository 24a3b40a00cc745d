"use client";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="mx-auto max-w-xl space-y-4 py-10">
      <h1 className="text-3xl font-semibold">Something went wrong</h1>
      <p className="text-muted">
        The page could not be shown. The problem has been logged
        {error.digest ? (
          <>
            {" "}
            with reference <code>{error.digest}</code>
          </>
        ) : null}
        . Nothing you saved is lost.
      </p>
      <button type="button" className="btn-primary" onClick={() => reset()}>
        Try again
      </button>
    </div>
  );
}

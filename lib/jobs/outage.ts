import { databaseUnavailable } from "@/lib/errors";

/**
 * Whether an unhandled rejection is PostgreSQL being briefly out of reach. pg-boss settles a job
 * (complete / fail) on its own connections; when the server restarts under a running job, that
 * call rejects inside pg-boss's loop with nobody to catch it. The job is not lost: pg-boss hands it
 * out again after its expiry. Such a rejection is survived; any other still ends the server.
 */
export function isDatabaseOutage(reason: unknown): boolean {
  if (databaseUnavailable(reason)) return true;
  const message = reason instanceof Error ? reason.message : String(reason);
  return /Connection terminated|terminating connection due to administrator command|the database system is (starting up|shutting down|in recovery mode)/i.test(
    message,
  );
}

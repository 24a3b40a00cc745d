// Sizes shared by the server and the editor in the browser (no server-only imports here).

/** Largest JSON text accepted, bytes (the same limit as an uploaded file). */
export const MAX_DOCUMENT_BYTES = 25 * 1024 * 1024;

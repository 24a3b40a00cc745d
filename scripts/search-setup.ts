// npm run search:setup: creates the Meilisearch index if needed and applies its settings
// (searchable attributes in weight order, filterable and sortable attributes, synonyms from the
// species names), waiting until the service has applied them. Idempotent; run it again after new
// species names arrive. Nothing to do for the PostgreSQL engine (its schema comes with migrations).
import { meilisearchConfig } from "@/lib/config";
import { applyIndexSettings } from "@/lib/search/meili/client";

const config = meilisearchConfig();
if (!config) {
  console.log("[arrhenia] MEILISEARCH_URL is not set: search stays in PostgreSQL, nothing to set up");
  process.exit(0);
}
const settings = await applyIndexSettings(config);
console.log(
  `[arrhenia] index "${config.index}" at ${config.host}: ${settings.searchableAttributes.length} searchable, ${settings.filterableAttributes.length} filterable, ${settings.sortableAttributes.length} sortable attributes, ${Object.keys(settings.synonyms).length} synonym entries`,
);
process.exit(0);

import { API_ENDPOINTS } from "@/lib/api/endpoints";
import type { ApiTokenScope } from "@/lib/users/queries";

/**
 * The token scope each endpoint needs, as published on /docs/api, from the one endpoint list
 * (lib/api/endpoints.ts). A test checks every route handler declares exactly this in its withApi
 * options. null: public, no scope needed (a token sent anyway must still be valid).
 */
export const endpointScopes: { method: string; path: string; scope: ApiTokenScope | null; who: string }[] = API_ENDPOINTS.map(
  ({ method, path, scope, who }) => ({ method, path, scope, who }),
);

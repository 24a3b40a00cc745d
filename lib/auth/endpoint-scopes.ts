import type { ApiTokenScope } from "@/lib/users/queries";

/**
 * The token scope each endpoint needs, as published on /docs/api. A test checks every route
 * handler declares exactly this in its withApi options. null: public, no scope needed (a token
 * sent anyway must still be valid).
 */
export const endpointScopes: { method: string; path: string; scope: ApiTokenScope | null; who: string }[] = [
  { method: "POST", path: "/api/v1/analyses", scope: null, who: "anyone" },
  { method: "GET", path: "/api/v1/species/preview", scope: null, who: "anyone" },
  { method: "GET", path: "/api/v1/search", scope: null, who: "anyone (published and retracted datasets only)" },
  { method: "GET", path: "/api/v1/search/suggest", scope: null, who: "anyone (published data only)" },
  { method: "GET", path: "/api/v1/reactions/:id/consensus", scope: null, who: "anyone" },
  { method: "GET", path: "/api/v1/identifiers", scope: null, who: "anyone" },
  { method: "POST", path: "/api/v1/datasets", scope: "deposit", who: "researchers" },
  { method: "GET", path: "/api/v1/datasets/:id/citation", scope: null, who: "anyone, for published and retracted versions" },
  {
    method: "GET",
    path: "/api/v1/datasets/:id/versions/:n/datacite.json",
    scope: null,
    who: "anyone, for published and retracted versions",
  },
  {
    method: "GET",
    path: "/api/v1/datasets/:id/versions/:n/datacite.xml",
    scope: null,
    who: "anyone, for published and retracted versions",
  },
  {
    method: "GET",
    path: "/api/v1/datasets/:id/versions/:n/parameters",
    scope: null,
    who: "anyone, for published and retracted versions",
  },
  {
    method: "GET",
    path: "/api/v1/datasets/:id/versions/:n/export.json",
    scope: null,
    who: "anyone, for published and retracted versions",
  },
  { method: "GET", path: "/api/v1/reactions/:id/parameters", scope: null, who: "anyone (reactions with published data)" },
  { method: "GET", path: "/api/v1/search/export", scope: null, who: "anyone (published and retracted datasets only)" },
  { method: "GET", path: "/api/v1/versions/:id", scope: "read", who: "anyone for published versions; co-editors and curators otherwise" },
  { method: "PUT", path: "/api/v1/versions/:id", scope: "deposit", who: "owner and editors of a draft" },
  {
    method: "POST",
    path: "/api/v1/versions/:id/transitions",
    scope: "deposit",
    who: "owner (submit, withdraw); curators (review, decide, retract)",
  },
  { method: "GET", path: "/api/v1/versions/:id/points.csv", scope: null, who: "anyone, for published and retracted versions" },
  { method: "GET", path: "/api/v1/versions/:id/points.json", scope: null, who: "anyone, for published and retracted versions" },
  { method: "POST", path: "/api/v1/versions/:id/next", scope: "deposit", who: "owner of a published version" },
  { method: "GET", path: "/api/v1/versions/:id/files", scope: "read", who: "whoever may see the version" },
  { method: "POST", path: "/api/v1/versions/:id/files", scope: "deposit", who: "owner and editors of a draft" },
  { method: "GET", path: "/api/v1/files/:fileId", scope: "read", who: "whoever may see the version" },
  { method: "DELETE", path: "/api/v1/files/:fileId", scope: "deposit", who: "owner and editors of a draft" },
  { method: "GET", path: "/api/v1/users", scope: "admin", who: "admins" },
  { method: "PATCH", path: "/api/v1/users/:id", scope: "admin", who: "admins" },
];

// GET /api/v1/openapi.json — this API as an OpenAPI 3.1 document (made from the endpoint list and the handlers' zod schemas)
import { NextResponse } from "next/server";
import { buildOpenApiDocument } from "@/lib/api/openapi";
import { withApi } from "@/lib/auth/api";
import { appUrl } from "@/lib/config";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi(async () => NextResponse.json(buildOpenApiDocument(appUrl())), { scope: null, cache: PUBLIC_READ_CACHE });

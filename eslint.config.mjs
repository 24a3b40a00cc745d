import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  // Layering: pure computation knows no framework or database; pages and components reach data
  // only through lib/*/queries.ts; the database layer imports no domain service.
  {
    files: ["lib/kinetics/**", "lib/chem/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            { group: ["@/db", "@/db/*", "**/db/*"], message: "lib/kinetics and lib/chem are pure: no database access." },
            {
              group: ["next", "next/*", "react", "react/*", "react-dom", "react-dom/*"],
              message: "lib/kinetics and lib/chem are pure: no Next.js or React.",
            },
            { group: ["@/app/*", "@/components/*"], message: "lib/kinetics and lib/chem are pure: no pages or components." },
          ],
        },
      ],
    },
  },
  {
    files: ["app/**", "components/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/db", "@/db/*", "**/db/*"],
              message: "Pages, actions, handlers and components call lib/*/queries.ts, never the database layer.",
            },
          ],
        },
      ],
    },
  },
  {
    files: ["db/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/lib/*", "!@/lib/config", "@/app/*", "@/components/*"],
              message: "db/ is the bottom layer: it imports configuration only, no domain service (the demo seed lives in scripts/seed/).",
            },
          ],
        },
      ],
    },
  },
  {
    // Request bodies are read only through lib/http/read-body.ts, which enforces a byte limit.
    files: ["app/**/*.ts", "app/**/*.tsx", "lib/**/*.ts"],
    ignores: ["lib/http/read-body.ts"],
    rules: {
      "no-restricted-syntax": [
        "error",
        {
          selector:
            "CallExpression[callee.object.name=/^(req|request)$/][callee.property.name=/^(json|text|formData|arrayBuffer|blob|bytes)$/]",
          message: "Read request bodies with lib/http/read-body.ts (streamed, with a byte limit).",
        },
      ],
    },
  },
  {
    ignores: [
      ".next/**",
      ".next-test/**",
      ".next-bench/**",
      "node_modules/**",
      ".data/**",
      "drizzle/**",
      "test-results/**",
      "playwright-report/**",
      "next-env.d.ts",
    ],
  },
];

export default config;

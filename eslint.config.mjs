import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  {
    // Request bodies are read only through lib/http/read-body.ts, which enforces a byte limit.
    files: ["app/**/*.ts", "app/**/*.tsx", "lib/**/*.ts"],
    ignores: ["lib/http/read-body.ts"],
    rules: {
      "no-restricted-syntax": [
        "error",
        {
          selector: "CallExpression[callee.object.name=/^(req|request)$/][callee.property.name=/^(json|text|formData|arrayBuffer|blob|bytes)$/]",
          message: "Read request bodies with lib/http/read-body.ts (streamed, with a byte limit).",
        },
      ],
    },
  },
  {
    ignores: [".next/**", ".next-test/**", "node_modules/**", ".data/**", "drizzle/**", "test-results/**", "playwright-report/**", "next-env.d.ts"],
  },
];

export default config;

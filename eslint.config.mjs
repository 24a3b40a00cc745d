import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [".next/**", ".next-test/**", "node_modules/**", ".data/**", "drizzle/**", "test-results/**", "playwright-report/**", "next-env.d.ts"],
  },
];

export default config;

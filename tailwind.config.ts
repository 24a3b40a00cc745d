import type { Config } from "tailwindcss";

// Tailwind 4 reads design tokens from @theme in app/globals.css; this file (loaded there with
// @config) only lists where classes are used.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
};

export default config;

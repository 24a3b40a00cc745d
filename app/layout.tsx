import "@fontsource-variable/inter";
import "@fontsource-variable/source-serif-4";
import "./globals.css";
import type { Metadata } from "next";
import Link from "next/link";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { Providers } from "@/components/providers";
import { SiteHeader } from "@/components/site-header";

export const metadata: Metadata = {
  title: { default: "Arrhenia — curated rate constants", template: "%s · Arrhenia" },
  description: "An open, curated repository of chemical rate-constant datasets, each re-fitted the same way and citable by version.",
};

/** The public pages every footer links. */
const BROWSE_LINKS = [
  ["/reactions", "Reactions"],
  ["/classes", "Reaction classes"],
  ["/search", "Search"],
  ["/analyse", "Fit your own data"],
  ["/docs/api", "API"],
  ["/docs/deposit-format", "Deposit format"],
] as const;

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-screen antialiased">
        <a
          href="#main"
          className="sr-only focus:not-sr-only focus:absolute focus:left-4 focus:top-2 focus:z-50 focus:rounded-sm focus:bg-panel focus:px-3 focus:py-2"
        >
          Skip to content
        </a>
        <Providers>
          <SiteHeader />
          <main id="main" className="mx-auto w-full max-w-6xl px-4 py-8 sm:px-6">
            {children}
          </main>
        </Providers>
        <footer className="mx-auto max-w-6xl space-y-3 px-4 pb-10 pt-4 text-xs text-muted sm:px-6">
          <nav aria-label="Browse">
            <ul className="flex flex-wrap gap-x-4 gap-y-1">
              {BROWSE_LINKS.map(([href, label]) => (
                <li key={href}>
                  <Link href={href}>{label}</Link>
                </li>
              ))}
            </ul>
          </nav>
          <p>Rate parameters are shown as deposited and re-fitted automatically. {CAUTION}</p>
        </footer>
      </body>
    </html>
  );
}

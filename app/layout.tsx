import "@fontsource-variable/inter";
import "@fontsource-variable/source-serif-4";
import "./globals.css";
import type { Metadata } from "next";
import { Providers } from "@/components/providers";
import { SiteHeader } from "@/components/site-header";

export const metadata: Metadata = {
  title: { default: "Arrhenia — curated rate constants", template: "%s · Arrhenia" },
  description: "An open, curated repository of chemical rate-constant datasets, each re-fitted the same way and citable by version.",
};

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
        <footer className="mx-auto max-w-6xl px-4 pb-10 pt-4 text-xs text-muted sm:px-6">
          Rate parameters are shown as deposited and re-fitted automatically. Extrapolation outside the measured range is unreliable, and
          safety-critical use (reactor, storage, process hazards) needs qualified review under local codes.
        </footer>
      </body>
    </html>
  );
}

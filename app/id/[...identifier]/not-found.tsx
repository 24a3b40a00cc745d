"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/** A mistyped, malformed or unknown identifier: answered 404 with what was typed and how to check it. */
export default function IdentifierNotFound() {
  const typed = safeDecode((usePathname() ?? "").replace(/^\/id\//, ""));
  return (
    <article className="space-y-3">
      <h1 className="text-2xl font-semibold">Nothing published has this identifier</h1>
      <p role="alert">
        The identifier is mistyped, is not one of this repository&apos;s, or names nothing published. Our identifiers look like
        10.5072/ARH-4F7K-9QXM (a dataset) or 10.5072/ARH-4F7K-9QXM/2 (one of its versions); the last symbol of the code checks the others,
        so compare it with the citation symbol by symbol.
      </p>
      <p className="font-mono text-sm break-all">{typed}</p>
      <p>
        <Link href="/search">Search the datasets</Link>
      </p>
    </article>
  );
}

function safeDecode(text: string): string {
  try {
    return decodeURIComponent(text);
  } catch {
    return text;
  }
}

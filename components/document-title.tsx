"use client";

import { useEffect } from "react";

/**
 * Sets the browser tab's title from a page Next renders without its own metadata (the 403 page is
 * drawn inside the refused route, whose metadata would otherwise name the tab).
 */
export function DocumentTitle({ title }: { title: string }) {
  useEffect(() => {
    const before = document.title;
    document.title = title;
    return () => {
      document.title = before;
    };
  }, [title]);
  return null;
}

"use client";

import { useEffect, useRef, useState, type ReactNode } from "react";

/**
 * A table or code block that may be wider than the screen: it scrolls sideways inside this
 * region, which the keyboard reaches (tabindex 0, then the arrow keys), a screen reader announces
 * by its label, and which says so in words whenever its content is wider than it.
 */
export function ScrollRegion({
  label,
  children,
  className = "",
  scrollClassName = "overflow-x-auto",
}: {
  label: string;
  children: ReactNode;
  /** Classes of the outer box (card, margins). */
  className?: string;
  /** Classes of the scrolling box; vertical scrolling too with e.g. "max-h-[36rem] overflow-auto". */
  scrollClassName?: string;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const [overflows, setOverflows] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const check = () => setOverflows(el.scrollWidth > el.clientWidth + 1);
    check();
    const observer = new ResizeObserver(check);
    observer.observe(el);
    if (el.firstElementChild) observer.observe(el.firstElementChild);
    return () => observer.disconnect();
  }, []);
  // The scrolling box is positioned, so absolutely placed content (screen-reader-only labels in
  // cells) is clipped there too instead of widening the page.
  // The note comes first: below a long table a reader would meet it only after the part cut off.
  return (
    <div className={`min-w-0 space-y-1 ${className}`}>
      {overflows && (
        <p className="text-xs text-muted" aria-hidden="true">
          ↔ Wider than the screen: scroll sideways (or focus it and use the arrow keys) to see all of it.
        </p>
      )}
      <div
        ref={ref}
        role="region"
        aria-label={label}
        tabIndex={0}
        className={`relative ${scrollClassName} rounded-sm focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-link`}
      >
        {children}
      </div>
    </div>
  );
}

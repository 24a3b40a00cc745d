import { useEffect, useRef, useState } from "react";

/** Width (px) of the plot area an axis label needs: "1000" at 12 px plus a gap. */
const LABEL_SPACING_PX = 64;

/**
 * The element's width, followed as it changes, and how many ticks a horizontal axis of that
 * width holds without labels crowding (at most `most`, at least 2). Before the first
 * measurement the width is unknown and `most` ticks are assumed.
 */
export function usePlotWidth<T extends HTMLElement>(most = 5, reserved = 112) {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState<number | null>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const observer = new ResizeObserver(([entry]) => setWidth(Math.round(entry.contentRect.width)));
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  const tickCount = width === null ? most : Math.max(2, Math.min(most, Math.floor((width - reserved) / LABEL_SPACING_PX)));
  return { ref, width, tickCount };
}

"use client";

import { useEffect, useState } from "react";

/** `value` once it has stayed the same for `ms` milliseconds (the previous settled value until then). */
export function useDebouncedValue<T>(value: T, ms: number): T {
  const [current, setCurrent] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setCurrent(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return current;
}

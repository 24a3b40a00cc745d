"use client";

import { useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect, useId, useRef, useState, type FormEvent, type KeyboardEvent } from "react";
import { useDebouncedValue } from "@/components/use-debounced-value";
import { fetchSuggestions, suggestionCountWords, suggestionHref, type Suggestion } from "./suggestions";

/** Typing pauses this long before suggestions are asked for. */
export const SUGGEST_DELAY_MS = 200;

/**
 * The header's search box: a combobox (WAI-ARIA 1.2, list autocomplete) offering species and
 * reactions as one types. Down/Up move through the suggestions (and open the list), Home/End go to
 * the first/last one while one is chosen, Enter opens the chosen one (or searches for the text when
 * none is), Escape closes the list (or, when closed, clears the box). Focus stays in the box; the
 * chosen option is named by aria-activedescendant, and a polite status says how many were found.
 */
export function SiteSearch() {
  const router = useRouter();
  const id = useId();
  const listId = `${id}-list`;
  const input = useRef<HTMLInputElement>(null);
  const [text, setText] = useState("");
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(-1);
  const term = useDebouncedValue(text.trim(), SUGGEST_DELAY_MS);

  const query = useQuery({
    queryKey: ["suggest", term],
    queryFn: ({ signal }) => fetchSuggestions(term, signal),
    enabled: term.length > 0,
    staleTime: 60_000,
    retry: false,
  });
  const suggestions: Suggestion[] = term.length > 0 && text.trim() === term ? (query.data ?? []) : [];
  const expanded = open && suggestions.length > 0;

  // The chosen suggestion is scrolled into the list's view (the list shows about eight at a time).
  useEffect(() => {
    if (expanded && active >= 0) document.getElementById(`${id}-option-${active}`)?.scrollIntoView({ block: "nearest" });
  }, [expanded, active, id]);

  function choose(s: Suggestion) {
    setOpen(false);
    setActive(-1);
    setText(s.label);
    router.push(suggestionHref(s));
  }

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (expanded && active >= 0 && suggestions[active]) return choose(suggestions[active]);
    const q = text.trim();
    setOpen(false);
    router.push(q ? `/search?${new URLSearchParams({ q }).toString()}` : "/search");
  }

  function onKeyDown(e: KeyboardEvent<HTMLInputElement>) {
    const last = suggestions.length - 1;
    switch (e.key) {
      case "ArrowDown":
        if (suggestions.length === 0) return;
        e.preventDefault();
        setOpen(true);
        setActive((a) => (!expanded ? 0 : a >= last ? 0 : a + 1));
        return;
      case "ArrowUp":
        if (suggestions.length === 0) return;
        e.preventDefault();
        setOpen(true);
        setActive((a) => (!expanded ? last : a <= 0 ? last : a - 1));
        return;
      case "Home":
      case "End":
        // With a suggestion chosen they move through the list; otherwise they move the caret as usual.
        if (!expanded || active < 0) return;
        e.preventDefault();
        setActive(e.key === "Home" ? 0 : last);
        return;
      case "Escape":
        if (expanded) {
          e.preventDefault();
          setOpen(false);
          setActive(-1);
        } else if (text) {
          e.preventDefault();
          setText("");
        }
        return;
    }
  }

  const status =
    term.length === 0 || text.trim() !== term
      ? ""
      : query.isFetching
        ? ""
        : query.isError
          ? "Suggestions are unavailable; press Enter to search."
          : suggestionCountWords(suggestions);

  return (
    <form
      action="/search"
      method="get"
      role="search"
      onSubmit={submit}
      className="relative order-last flex w-full items-center sm:order-none sm:w-auto sm:min-w-48 sm:flex-1"
    >
      <label htmlFor={`${id}-input`} className="sr-only">
        Search datasets, species and reactions
      </label>
      <input
        ref={input}
        id={`${id}-input`}
        name="q"
        type="text"
        role="combobox"
        aria-autocomplete="list"
        aria-expanded={expanded}
        aria-controls={listId}
        aria-activedescendant={expanded && active >= 0 ? `${id}-option-${active}` : undefined}
        aria-describedby={`${id}-status`}
        autoComplete="off"
        spellCheck={false}
        enterKeyHint="search"
        placeholder="Search reactions, species, authors…"
        className="field-input max-w-md"
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
          setActive(-1);
        }}
        onKeyDown={onKeyDown}
        onFocus={() => setOpen(true)}
        onBlur={() => setOpen(false)}
      />
      <ul
        id={listId}
        role="listbox"
        aria-label="Suggestions"
        className={`${expanded ? "" : "hidden"} absolute left-0 top-full z-50 mt-1 max-h-80 w-full max-w-md overflow-y-auto rounded-md border border-line bg-panel py-1 text-sm shadow-md`}
      >
        {suggestions.map((s, i) => (
          <li
            key={`${s.kind}:${s.q}:${i}`}
            id={`${id}-option-${i}`}
            role="option"
            aria-selected={i === active}
            // mousedown, not click: the input's blur would close the list before a click lands.
            onMouseDown={(e) => {
              e.preventDefault();
              choose(s);
            }}
            onMouseMove={() => setActive(i)}
            className={`flex cursor-pointer items-baseline justify-between gap-3 px-3 py-1.5 ${i === active ? "bg-paper outline-2 -outline-offset-2 outline-accent" : ""}`}
          >
            <span className="min-w-0 break-words">
              {s.label}
              {s.detail && <span className="text-muted"> — {s.detail}</span>}
            </span>
            <span className="shrink-0 text-xs text-muted">{s.kind === "species" ? "species" : "reaction"}</span>
          </li>
        ))}
      </ul>
      <p id={`${id}-status`} role="status" aria-live="polite" className="sr-only">
        {status}
      </p>
    </form>
  );
}

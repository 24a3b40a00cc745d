"use client";

import { useEffect, useMemo, useRef } from "react";

export interface LeaveGuard {
  allow: () => void;
  leave: (go: () => void) => void;
  replaceAddress: (path: string) => void;
}

export const LEAVE_QUESTION = "Some changes to this draft are not saved yet. Leave the page and lose them?";

/**
 * Asks before the page is left while `unsaved` is true: closing or reloading the tab
 * (beforeunload), any link to another page (the App Router has no route-change events, so clicks
 * are caught on the window in the capture phase, before Next's Link sees them) and the back button
 * (a same-URL guard entry is pushed on the history; going back pops it and we ask). Nothing is
 * asked once everything is saved. `allow()` lets one navigation through; `leave(go)` is the editor's
 * own move to another page, which first takes the guard entry off the history.
 */
export function useLeaveGuard(unsaved: boolean): LeaveGuard {
  const unsavedRef = useRef(unsaved);
  const allowed = useRef(false);
  const guarded = useRef(false);
  // The address of this page's (top) history entry, to restore when the person stays.
  const address = useRef("");

  useEffect(() => {
    unsavedRef.current = unsaved;
    if (unsaved && !guarded.current) {
      // Next keeps its router state in history.state: the guard entry carries the same.
      address.current = window.location.href;
      window.history.pushState(window.history.state, "", address.current);
      guarded.current = true;
    }
  }, [unsaved]);

  useEffect(() => {
    const ask = () => window.confirm(LEAVE_QUESTION);

    const onBeforeUnload = (e: BeforeUnloadEvent) => {
      if (!unsavedRef.current || allowed.current) return;
      e.preventDefault();
      // Older browsers show the prompt only when returnValue is set.
      e.returnValue = "";
    };

    const onClick = (e: MouseEvent) => {
      if (!unsavedRef.current || allowed.current || e.defaultPrevented || e.button !== 0) return;
      if (e.metaKey || e.ctrlKey || e.shiftKey || e.altKey) return; // a new tab or window leaves nothing
      const link = (e.target as Element | null)?.closest?.("a[href]");
      if (!(link instanceof HTMLAnchorElement) || link.target === "_blank" || link.hasAttribute("download")) return;
      const to = new URL(link.href, window.location.href);
      const here = window.location;
      // Anchors within this page (the section list) leave nothing.
      if (to.origin === here.origin && to.pathname === here.pathname && to.search === here.search && to.hash !== "") return;
      if (ask()) {
        allowed.current = true;
        return;
      }
      e.preventDefault();
      e.stopPropagation();
    };

    const onPopState = () => {
      if (!guarded.current || allowed.current) return;
      // The guard entry was just popped: we are on the same page, one entry back.
      guarded.current = false;
      if (!unsavedRef.current || ask()) {
        allowed.current = true;
        window.history.back();
        return;
      }
      window.history.pushState(window.history.state, "", address.current);
      guarded.current = true;
    };

    window.addEventListener("beforeunload", onBeforeUnload);
    window.addEventListener("click", onClick, true);
    window.addEventListener("popstate", onPopState);
    return () => {
      window.removeEventListener("beforeunload", onBeforeUnload);
      window.removeEventListener("click", onClick, true);
      window.removeEventListener("popstate", onPopState);
    };
  }, []);

  return useMemo(
    () => ({
      allow: () => {
        allowed.current = true;
      },
      /**
       * Lets `go` (a router replace) move this page elsewhere once the guard entry is off the
       * history: otherwise that entry's twin stays beneath the new page and Back shows this one again.
       */
      leave: (go: () => void) => {
        allowed.current = true;
        if (!guarded.current) return go();
        guarded.current = false;
        let done = false;
        const once = () => {
          if (done) return;
          done = true;
          window.removeEventListener("popstate", once);
          go();
        };
        window.addEventListener("popstate", once);
        window.history.back();
        // A traversal the browser never reports still moves on.
        setTimeout(once, 1000);
      },
      /** Gives this page's entry another address (a new draft's own), without a navigation. */
      replaceAddress: (path: string) => {
        address.current = new URL(path, window.location.href).href;
        window.history.replaceState(null, "", address.current);
      },
    }),
    [],
  );
}

"use client";

import Link from "next/link";
import { useId, useRef, useState, type KeyboardEvent } from "react";
import { SignOutButton } from "./sign-out-button";

export interface NavLink {
  href: string;
  label: string;
}

/**
 * The site's links. Signed-in people have more links than a phone's width holds, so below the
 * large breakpoint their links, name and sign-out fold into a menu opened by a button
 * (aria-expanded; Escape closes it and returns focus to the button). Anonymous visitors have
 * four links, always shown.
 */
export function MainNav({ links, user }: { links: NavLink[]; user: { name: string; email: string; role: string } | null }) {
  const [open, setOpen] = useState(false);
  const button = useRef<HTMLButtonElement>(null);
  const panelId = useId();
  const close = () => setOpen(false);
  const onKeyDown = (e: KeyboardEvent) => {
    if (e.key === "Escape" && open) {
      close();
      button.current?.focus();
    }
  };
  const linkList = (
    <ul className={`flex gap-x-4 gap-y-2 ${user ? "flex-col lg:flex-row lg:flex-wrap lg:items-center" : "flex-wrap items-center"}`}>
      {links.map((l) => (
        <li key={l.href}>
          <Link href={l.href} onClick={close}>
            {l.label}
          </Link>
        </li>
      ))}
    </ul>
  );
  if (!user) {
    return (
      <nav aria-label="Main" className="flex flex-wrap items-center gap-x-4 gap-y-2 text-sm">
        {linkList}
        <Link href="/sign-in">Sign in</Link>
        <Link href="/sign-up" className="btn-primary no-underline hover:no-underline">
          Create account
        </Link>
      </nav>
    );
  }
  return (
    <nav aria-label="Main" className="relative text-sm" onKeyDown={onKeyDown}>
      <button
        ref={button}
        type="button"
        className="btn-secondary py-1 lg:hidden"
        aria-expanded={open}
        aria-controls={panelId}
        onClick={() => setOpen((o) => !o)}
      >
        <span aria-hidden="true">☰</span> Menu
      </button>
      <div
        id={panelId}
        className={`${open ? "absolute right-0 top-full z-40 mt-2 flex w-64 max-w-[calc(100vw-2rem)] flex-col gap-4 rounded-lg border border-line bg-panel p-4 shadow-md" : "hidden"} lg:static lg:mt-0 lg:flex lg:w-auto lg:max-w-none lg:flex-row lg:flex-wrap lg:items-center lg:gap-4 lg:border-0 lg:bg-transparent lg:p-0 lg:shadow-none`}
      >
        {linkList}
        <div className="flex flex-wrap items-center gap-3 border-t border-line pt-3 lg:border-0 lg:pt-0">
          <span className="text-muted" title={user.email}>
            {user.name} <span className="rounded-sm bg-paper px-1.5 py-0.5 text-xs">{user.role}</span>
          </span>
          <SignOutButton />
        </div>
      </div>
    </nav>
  );
}

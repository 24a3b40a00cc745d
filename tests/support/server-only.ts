// Stand-in for the "server-only" marker package in vitest (it throws outside React Server Components).
export {};

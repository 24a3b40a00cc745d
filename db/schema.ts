// Every table of the application, one file per aggregate.
export * from "./users";
export * from "./tokens";
export * from "./audit";
export * from "./mail";
export * from "./rate-limits";
export * from "./chemistry";
export * from "./datasets";
export * from "./idempotency";
export * from "./consensus";
export * from "./search";
export * from "./search-outbox";
export * from "./oai";
export * from "./watches";
export * from "./people";
export * from "./mechanisms";
export * from "./collections";
export * from "./kept-pages-schema";

import { afterEach, describe, expect, it } from "vitest";
import {
  assertValidConfig,
  bcryptRounds,
  ConfigError,
  configProblems,
  dbPoolSize,
  fakeDoiDataDir,
  frontHeapMb,
  jobRetryDelaySeconds,
  nextHeapMb,
  seedsDemoDatasets,
  serverPort,
  storageDir,
} from "@/lib/config";
import { doiPrefix } from "@/lib/identifiers/mint";

const saved = { ...process.env };
afterEach(() => {
  for (const k of Object.keys(process.env)) if (!(k in saved)) delete process.env[k];
  Object.assign(process.env, saved);
});

describe("configuration", () => {
  it("accepts the environment npm test runs with", () => {
    expect(configProblems()).toEqual([]);
    expect(() => assertValidConfig()).not.toThrow();
  });

  it("gives the documented defaults when variables are unset or empty", () => {
    const env = { ...process.env };
    for (const k of ["BCRYPT_ROUNDS", "DB_POOL_SIZE", "JOB_RETRY_DELAY_SECONDS", "PORT", "STORAGE_DIR", "SEED_DATASETS", "DOI_PREFIX"])
      delete process.env[k];
    process.env.DB_POOL_SIZE = "";
    expect([bcryptRounds(), dbPoolSize(), jobRetryDelaySeconds(), serverPort(), storageDir(), seedsDemoDatasets(), doiPrefix()]).toEqual([
      11,
      10,
      15,
      3000,
      undefined,
      true,
      "10.5072",
    ]);
    expect(configProblems(env)).toEqual([]);
  });

  it("reads and converts set values", () => {
    Object.assign(process.env, {
      BCRYPT_ROUNDS: "6",
      DB_POOL_SIZE: "3",
      JOB_RETRY_DELAY_SECONDS: "0",
      SEED_DATASETS: "0",
      DOI_PREFIX: "10.5555",
      DOI_FAKE_DATA_DIR: "",
    });
    expect([bcryptRounds(), dbPoolSize(), jobRetryDelaySeconds(), seedsDemoDatasets(), doiPrefix(), fakeDoiDataDir()]).toEqual([
      6,
      3,
      0,
      false,
      "10.5555",
      null,
    ]);
  });

  it("gives the two processes their heap budgets, 288 and 416 MB unless set, and refuses a budget too small to serve", () => {
    delete process.env.FRONT_HEAP_MB;
    delete process.env.NEXT_HEAP_MB;
    expect([frontHeapMb(), nextHeapMb()]).toEqual([288, 416]);
    Object.assign(process.env, { FRONT_HEAP_MB: "1024", NEXT_HEAP_MB: "2048" });
    expect([frontHeapMb(), nextHeapMb()]).toEqual([1024, 2048]);
    process.env.NEXT_HEAP_MB = "64";
    expect(configProblems().map((p) => p.split(" ")[0])).toContain("NEXT_HEAP_MB");
  });

  it("lists every bad value in one error, naming the variable and never echoing a secret", () => {
    const env = {
      BCRYPT_ROUNDS: "eleven",
      DB_POOL_SIZE: "0",
      PORT: "70000",
      DOI_PREFIX: "10.1/x",
      NEXTAUTH_SECRET: "short",
      DATABASE_URL: "mysql://u:hunter2@h/db",
      SEED_DATASETS: "yes",
    };
    const problems = configProblems(env);
    expect(problems).toHaveLength(7);
    expect(problems).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^BCRYPT_ROUNDS must be a number \(got "eleven"\)$/),
        expect.stringMatching(/^DB_POOL_SIZE must be 1–100/),
        expect.stringMatching(/^PORT must be 1–65535/),
        expect.stringMatching(/^DOI_PREFIX must be a DOI prefix/),
        expect.stringMatching(/^NEXTAUTH_SECRET must be at least 16 characters/),
        expect.stringMatching(/^DATABASE_URL must be a postgres/),
        expect.stringMatching(/^SEED_DATASETS must be 0 or 1/),
      ]),
    );
    expect(problems.join("\n")).not.toMatch(/hunter2|"short"/);
    expect(() => assertValidConfig(env)).toThrow(ConfigError);
    expect(() => assertValidConfig(env)).toThrow(/Invalid configuration[\s\S]*BCRYPT_ROUNDS/);
  });

  it("a getter refuses a bad value instead of using NaN", () => {
    process.env.DB_POOL_SIZE = "ten";
    expect(() => dbPoolSize()).toThrow(/DB_POOL_SIZE must be a number/);
  });
});

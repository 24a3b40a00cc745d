import { describe, expect, it } from "vitest";
import { checkMechanismSize, MAX_MECHANISM_DEPTH, precheckMechanismText } from "@/lib/mechanisms/limits";
import { readMechanism } from "@/lib/mechanisms/read-mechanism";

describe("mechanism pre-check", () => {
  it("refuses a run of a million nested brackets at once, naming where", () => {
    const bomb = "reactions: " + "[".repeat(1_000_000) + "]".repeat(1_000_000);
    const started = performance.now();
    const failure = precheckMechanismText(bomb);
    expect(performance.now() - started).toBeLessThan(500);
    expect(failure).toMatchObject({ code: "too_deep", line: 1, column: 12 + MAX_MECHANISM_DEPTH - 1 });
    expect(readMechanism(bomb)).toMatchObject({ ok: false, failure: { code: "too_deep" } });
  });

  it("refuses deep YAML blocks, by indentation and by '- ' runs", () => {
    const indented = Array.from({ length: 70 }, (_, i) => `${" ".repeat(i)}k${i}:`).join("\n");
    expect(precheckMechanismText(indented)).toMatchObject({ code: "too_deep", line: 65 });
    const dashes = "reactions:\n" + "- ".repeat(80) + "x\n";
    expect(precheckMechanismText(dashes)).toMatchObject({ code: "too_deep", line: 2 });
  });

  it("counts brackets inside a plain scalar with a quote mark, but not inside quoted or commented text", () => {
    expect(precheckMechanismText(`note: 5" long\nx: ${"[".repeat(70)}`)).toMatchObject({ code: "too_deep", line: 2 });
    expect(precheckMechanismText(`note: "${"[".repeat(70)}"\n# ${"{".repeat(70)}\n! ${"(".repeat(5)}`)).toBeNull();
  });

  it("refuses binary content and overlong lines with line and column", () => {
    expect(precheckMechanismText("REACTIONS\nA=>B 1 0 0\u0000")).toMatchObject({ code: "not_text", line: 2, column: 11 });
    expect(precheckMechanismText("REACTIONS\n" + "A".repeat(100_001))).toMatchObject({ code: "line_too_long", line: 2 });
    expect(checkMechanismSize(20 * 1024 * 1024 + 1)?.message).toMatch(/at most 20 MB/);
    expect(checkMechanismSize(1000)).toBeNull();
  });

  it("lets an ordinary mechanism through", () => {
    expect(precheckMechanismText("units: {length: cm}\nreactions:\n- equation: A => B\n  rate-constant: {A: 1, b: 0, Ea: 0}\n")).toBeNull();
  });
});

import { describe, expect, it } from "vitest";
import { decimalsOf, niceScale, niceStep, PLOT_MARGIN, plotScale, temperatureTicks } from "@/components/plot-scales";

describe("niceScale", () => {
  it.each([
    [3.1, 4.62, [3, 3.5, 4, 4.5, 5]],
    [-35.2, -28.9, [-36, -34, -32, -30, -28]],
    [0.00123, 0.00456, [0.001, 0.002, 0.003, 0.004, 0.005]],
  ])("%s … %s → round ticks", (min, max, ticks) => {
    const s = niceScale(min, max);
    expect(s.ticks).toEqual(ticks);
    expect(s.domain).toEqual([ticks[0], ticks[ticks.length - 1]]);
  });

  it("labels written with the step's decimals never repeat", () => {
    for (const [min, max] of [
      [2.201, 2.209],
      [-31.02, -30.97],
      [1.9, 4.1],
      [100, 100],
    ]) {
      const s = niceScale(min, max);
      const labels = s.ticks.map((t) => t.toFixed(s.decimals));
      expect(new Set(labels).size).toBe(labels.length);
      expect(s.domain[0]).toBeLessThanOrEqual(min);
      expect(s.domain[1]).toBeGreaterThanOrEqual(max);
    }
  });

  it("steps are 1, 2, 2.5 or 5 × 10ⁿ", () => {
    expect(niceStep(7, 5)).toBe(2);
    expect(niceStep(0.9, 5)).toBe(0.2);
    expect(niceStep(12, 5)).toBe(2.5);
    // A narrow log₁₀ k axis (span 0.12): 0.02, never 0.025, whose labels need a third decimal.
    expect(niceStep(0.12, 5)).toBe(0.02);
    expect(decimalsOf(0.25)).toBe(2);
    expect(decimalsOf(50)).toBe(0);
  });
});

describe("temperatureTicks", () => {
  it("gives round kelvin values inside the 1000/T domain, distinct, ordered from cold to hot", () => {
    // 1000/T from 2 to 5 K⁻¹: 200 … 500 K.
    const ticks = temperatureTicks([2, 5]);
    expect(ticks.length).toBeGreaterThanOrEqual(3);
    for (const t of ticks) {
      expect(t.T % 10).toBe(0);
      expect(t.x).toBeCloseTo(1000 / t.T, 12);
      expect(t.x).toBeGreaterThanOrEqual(2);
      expect(t.x).toBeLessThanOrEqual(5);
    }
    const Ts = ticks.map((t) => t.T);
    expect(new Set(Ts).size).toBe(Ts.length);
    expect([...Ts].sort((a, b) => a - b)).toEqual(Ts);
  });

  it("keeps labels apart where high temperatures crowd together on the 1/T scale", () => {
    const ticks = temperatureTicks([0.5, 4]); // 250 … 2000 K
    for (let i = 1; i < ticks.length; i++) expect(Math.abs(ticks[i].x - ticks[i - 1].x)).toBeGreaterThanOrEqual(3.5 / 8);
  });

  it("leaves the top left corner free, where the label would stand over the ln k axis's top label", () => {
    // 1000/T from 2 to 5 K⁻¹: 500 K would sit on the corner.
    for (const count of [3, 5]) {
      const ticks = temperatureTicks([2, 5], count);
      expect(ticks.map((t) => t.T)).not.toContain(500);
      expect(ticks.every((t) => t.x >= 2 + (3 / (count * 1.3)) * 0.4)).toBe(true);
      expect(ticks.length).toBeGreaterThanOrEqual(3);
    }
  });

  it.each([
    [1000 / 450, 1000 / 190], // a dataset of 200–450 K
    [1000 / 810, 1000 / 690], // 700–800 K
    [1000 / 790, 1000 / 610], // 625–775 K
    [1000 / 1550, 1000 / 950], // 1000–1500 K
    [0.4, 5.2], // 200–2500 K
  ])("labels 1000/T from %f to %f by one regular rule: no round value skipped between two shown", (lo, hi) => {
    for (const count of [3, 5]) {
      const Ts = temperatureTicks([lo, hi], count).map((t) => t.T);
      expect(Ts.length).toBeGreaterThanOrEqual(2);
      const steps = Ts.slice(1).map((T, i) => T - Ts[i]);
      const uniform = steps.every((d) => Math.abs(d - steps[0]) < 1e-6);
      // Otherwise round values of every decade (1, 2, 5 or finer mantissas), each decade's own.
      const decadeRound = Ts.every((T) => Number((T / 10 ** Math.floor(Math.log10(T))).toFixed(6)) % 0.5 === 0);
      expect(uniform || decadeRound, `${Ts.join(", ")} at ${count} ticks`).toBe(true);
    }
  });

  it("labels a domain that starts at 1000/T = 0 (a wide computed range) instead of giving up", () => {
    const ticks = temperatureTicks([0, 5]);
    expect(ticks.length).toBeGreaterThanOrEqual(3);
    expect(ticks.every((t) => Number.isFinite(t.T) && t.x > 0 && t.x <= 5)).toBe(true);
  });
});

describe("plotScale: a margin inside the outer ticks", () => {
  it.each([
    [2.5, 4],
    [3, 5],
    [-30, -25],
    [0.001, 0.004],
  ])("data from %s to %s lie strictly inside the domain, by at least 4 % of their span", (min, max) => {
    const s = plotScale(min, max);
    const margin = (max - min) * PLOT_MARGIN;
    expect(s.domain[0]).toBeLessThanOrEqual(min - margin + 1e-12);
    expect(s.domain[1]).toBeGreaterThanOrEqual(max + margin - 1e-12);
  });

  it("keeps one value in the middle of its domain", () => {
    const s = plotScale(300, 300);
    expect(s.domain[0]).toBeLessThan(300);
    expect(s.domain[1]).toBeGreaterThan(300);
  });
});

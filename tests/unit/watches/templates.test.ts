import { describe, expect, it } from "vitest";
import { watchDigestMail, watchEventMail, watchNewsSubject, watchNewsText, type WatchNews } from "@/lib/mail/watch-templates";
import { readStopToken, signStopToken } from "@/lib/watches/token";

const version: WatchNews["version"] = {
  datasetId: 4,
  number: 2,
  title: "Invented rates",
  equation: "hydroxyl + methane → water + methyl",
  pointCount: 9,
  tMin: 250,
  tMax: 420,
  identifier: "10.99999/demo.2",
  retractionNotice: null,
  newer: null,
  flags: [],
};

describe("watch mail wording", () => {
  it("says what was published, what it replaces, and its identifier", () => {
    const news: WatchNews = { event: "published", version };
    expect(watchNewsSubject(news)).toBe("New on Arrhenia: Invented rates (version 2)");
    expect(watchNewsText(news)).toBe(
      "“Invented rates”, version 2, was published: hydroxyl + methane → water + methyl, 9 points over 250–420 K. It replaces version 1 of the dataset. Identifier: 10.99999/demo.2.",
    );
  });

  it("says why a version was retracted and what replaces it", () => {
    const text = watchNewsText({
      event: "retracted",
      version: { ...version, number: 1, retractionNotice: "Calibration error", newer: { number: 2, title: "Invented rates, corrected" } },
    });
    expect(text).toBe(
      "Version 1 of “Invented rates” (hydroxyl + methane → water + methyl) was retracted. The reason given: Calibration error. Version 2 of the dataset (“Invented rates, corrected”) replaces it. Its page stays, marked as retracted. Identifier: 10.99999/demo.2.",
    );
  });

  it("names the flags after a re-fit changed them", () => {
    expect(watchNewsText({ event: "flags_changed", version: { ...version, flags: ["curvature", "outliers"] } })).toContain(
      "changed its flags; they are now: curvature, outliers.",
    );
  });

  it("a single-watch mail has a one-click stop header; a digest counts its changes", () => {
    const token = signStopToken(12, 34);
    const mail = watchEventMail({
      to: "a@example.org",
      name: "A",
      news: { event: "published", version },
      reasons: ["the reaction X"],
      stops: [{ label: "the reaction X", token }],
    });
    expect(mail.headers?.["List-Unsubscribe-Post"]).toBe("List-Unsubscribe=One-Click");
    expect(mail.text).toContain("You hear of it because you watch the reaction X.");
    const digest = watchDigestMail({
      to: "a@example.org",
      name: "A",
      items: [{ news: { event: "published", version }, reasons: ["the reaction X"] }],
      stops: [],
    });
    expect(digest.subject).toBe("Arrhenia: 1 change to what you watch");
    expect(digest.headers).toBeUndefined();
  });

  it("a stop token names one watch of one person and refuses any change", () => {
    const token = signStopToken(12, 34);
    expect(readStopToken(token)).toEqual({ watchId: 12, userId: 34 });
    expect(readStopToken(token.replace(/^12\./, "13."))).toBeNull();
    expect(readStopToken(`${token}x`)).toBeNull();
    expect(readStopToken("")).toBeNull();
  });
});

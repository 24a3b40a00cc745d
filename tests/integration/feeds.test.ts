import { XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { GET as reactionFeedRoute } from "@/app/reactions/[id]/feed.xml/route";
import { GET as classFeedRoute } from "@/app/classes/[id]/feed.xml/route";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { reactionSegment } from "@/lib/reactions/paths";
import { createUser } from "@/lib/users/queries";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { sql, uniqueEmail } from "./helpers";

const get = (route: typeof reactionFeedRoute, path: string, id: string) =>
  route(new Request(`http://127.0.0.1${path}`), { params: Promise.resolve({ id }) });

describe("Atom feeds of a reaction and of a class", () => {
  it("carry each publication and retraction, never a draft or a submission; the id alias redirects; unknown → 404", async () => {
    const owner = await createUser({ email: uniqueEmail("feed"), name: "Feed Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("feedc"),
      name: "Feed Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const document = labelledAlkaneDeposit({ title: "Fed alkane A", name: "fed icosane", carbons: 23 });
    const a = await depositNewDataset({ actor: owner, document });
    const b = await depositNewDataset({ actor: owner, document: { ...document, title: "Fed alkane B" } });
    const draft = await depositNewDataset({ actor: owner, document: { ...document, title: "Fed alkane draft" } });
    await applyTransition({ versionId: draft.id, actorId: owner.id, transition: "submit" });
    for (const v of [a, b]) {
      await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
      await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    }
    await applyTransition({ versionId: b.id, actorId: curator.id, transition: "retract", reason: "A <calibration> error & more." });
    const [row] = await sql`select r.id, r.key from dataset_versions v join reactions r on r.id = v.reaction_id where v.id = ${a.id}`;
    const segment = reactionSegment(row.key as string);

    const res = await get(reactionFeedRoute, `/reactions/${segment}/feed.xml`, segment);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/atom+xml; charset=utf-8");
    const xml = await res.text();
    expect(XMLValidator.validate(xml)).toBe(true);
    const ids = [...xml.matchAll(/<id>([^<]+)<\/id>/g)].map((m) => m[1]);
    expect(ids[0]).toMatch(new RegExp(`/reactions/${segment.replace(/[+*]/g, "\\$&")}/feed\\.xml$`));
    // Newest first: the retraction, then the two publications.
    expect(ids.slice(1)).toEqual([
      expect.stringMatching(new RegExp(`/datasets/${b.datasetId}/v1#retracted$`)),
      expect.stringMatching(new RegExp(`/datasets/${b.datasetId}/v1$`)),
      expect.stringMatching(new RegExp(`/datasets/${a.datasetId}/v1$`)),
    ]);
    expect(xml).toContain("A &lt;calibration&gt; error &amp; more.");
    expect(xml).not.toContain("Fed alkane draft");

    const alias = await get(reactionFeedRoute, `/reactions/${row.id}/feed.xml`, String(row.id));
    expect(alias.status).toBe(308);
    expect(alias.headers.get("location")).toBe(`/reactions/${segment}/feed.xml`);
    expect((await get(reactionFeedRoute, "/reactions/2147483647/feed.xml", "2147483647")).status).toBe(404);
    expect((await get(reactionFeedRoute, "/reactions/nonsense/feed.xml", "nonsense")).status).toBe(404);

    const classRes = await get(classFeedRoute, "/classes/hydrogen-abstraction/feed.xml", "hydrogen-abstraction");
    expect(classRes.status).toBe(200);
    const classXml = await classRes.text();
    expect(XMLValidator.validate(classXml)).toBe(true);
    expect(classXml).toContain(`/datasets/${a.datasetId}/v1</id>`);
    expect(classXml).not.toContain("Fed alkane draft");
    expect((await get(classFeedRoute, "/classes/no-such-class/feed.xml", "no-such-class")).status).toBe(404);
  });
});

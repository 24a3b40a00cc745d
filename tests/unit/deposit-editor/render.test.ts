import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";
import { AboutSection } from "@/components/deposit-editor/about-section";
import { CreditSection } from "@/components/deposit-editor/credit-section";
import { EditorContextProvider } from "@/components/deposit-editor/editor-context";
import { blankForm, blankPoint, documentToForm, type EditorForm } from "@/components/deposit-editor/form-model";
import { readinessItems } from "@/components/deposit-editor/readiness";
import { ReadinessPanel } from "@/components/deposit-editor/readiness-panel";
import { PointsTable } from "@/components/deposit-editor/points-table";
import { versionCapabilities } from "@/lib/curation/capabilities";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";

vi.mock("next/navigation", () => ({ useRouter: () => ({ replace: vi.fn(), refresh: vi.fn(), push: vi.fn() }) }));
vi.mock("@/app/deposits/actions", () => ({ createDraftAction: vi.fn(), saveDraftAction: vi.fn(), transitionAction: vi.fn() }));

const noop = () => {};

function withContext(node: React.ReactElement, messages: Record<string, string[]> = {}, readOnly = false) {
  return renderToStaticMarkup(
    h(EditorContextProvider, { value: { readOnly, messagesFor: (p: string) => messages[p] ?? [], clearErrors: noop } }, node),
  );
}

describe("fields", () => {
  it("show a problem beside its input, tied to it for screen readers", () => {
    const html = withContext(h(AboutSection, { form: blankForm({ name: "Okafor, Maren" }), update: noop }), {
      "/title": ["Title must be at least 3 characters."],
    });
    expect(html).toContain('id="field-title"');
    expect(html).toMatch(/<input id="field-title"[^>]*aria-invalid="true"[^>]*aria-describedby="field-title-hint field-title-error"/);
    expect(html).toMatch(/id="field-title-error"[^>]*>.*Title must be at least 3 characters\./);
    const credit = withContext(h(CreditSection, { form: blankForm({ name: "Okafor, Maren" }), update: noop }));
    expect(credit).toContain('<label for="field-creators-0-name"');
    expect(credit).toContain('value="Okafor, Maren"');
    expect(credit).toContain("<legend");
  });

  it("group people, grants and linked records in one section of our own, apart from the title and summary", () => {
    const credit = withContext(h(CreditSection, { form: documentToForm(EXAMPLE_DEPOSIT), update: noop }));
    expect([...credit.matchAll(/<legend[^>]*>([^<]*)</g)].map((m) => m[1])).toEqual([
      "People, grants and links",
      "People credited",
      "Grants",
      "Linked records",
    ]);
    const about = withContext(h(AboutSection, { form: documentToForm(EXAMPLE_DEPOSIT), update: noop }));
    expect(about).not.toContain("field-creators-0-name");
    expect(about).not.toContain("field-funding");
  });

  it("hide add and remove buttons from a read-only editor", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    expect(withContext(h(CreditSection, { form, update: noop }))).toContain("Add a person");
    expect(withContext(h(CreditSection, { form, update: noop }), {}, true)).not.toContain("Add a person");
    const html = withContext(h(AboutSection, { form, update: noop }), {}, true);
    expect(html).toMatch(/<input id="field-title"[^>]*readOnly=""/);
  });
});

describe("PointsTable", () => {
  const big: EditorForm = {
    ...blankForm(),
    points: Array.from({ length: 1200 }, (_, i) => ({ ...blankPoint(), T: String(200 + i / 10), k: "1e-12" })),
  };

  it("shows the first 200 rows of a large table, with a note that every row is kept", () => {
    const html = withContext(
      h(PointsTable, { form: big, update: noop, windowStart: 0, onWindowStart: noop, kLabel: "cm³ molecule⁻¹ s⁻¹", TLabel: "K" }),
    );
    expect(html).toContain("Showing rows 1–200 of 1,200");
    expect(html).toContain("every row is kept and saved");
    expect(html).toContain('id="field-points-199-T"');
    expect(html).not.toContain('id="field-points-200-T"');
  });

  it("shows the window holding a row with a problem, and the problem in that row", () => {
    const html = withContext(h(PointsTable, { form: big, update: noop, windowStart: 600, onWindowStart: noop, kLabel: "K", TLabel: "K" }), {
      "/points/650/k": ["Rate constant must be greater than 0."],
    });
    expect(html).toContain("Showing rows 601–800 of 1,200");
    expect(html).toMatch(/<input id="field-points-650-k"[^>]*aria-invalid="true"/);
    expect(html).toContain("Rate constant must be greater than 0.");
  });

  it("shows every row of a small table, labelled for screen readers by row", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    const html = withContext(
      h(PointsTable, { form, update: noop, windowStart: 0, onWindowStart: noop, kLabel: "cm³ molecule⁻¹ s⁻¹", TLabel: "K" }),
    );
    expect(html).not.toContain("Showing rows");
    expect(html).toContain("k, row 10");
    expect(html).toContain("Pressure (Torr)");
    expect(html).toContain('Remove<span class="sr-only"> row 10</span>');
  });
});

describe("ReadinessPanel", () => {
  it("lists every problem in the order of the form, each linked to its input or its section", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    const errors = [
      { pointer: "/points/650/k", message: "not positive" },
      { pointer: "/title", message: "Title is too short." },
      { pointer: "/reaction/solvent", message: "Solvent is required when the phase is liquid." },
    ];
    const html = renderToStaticMarkup(h(ReadinessPanel, { items: readinessItems(errors, form), onShowRow: noop }));
    expect(html).toContain("Not ready to submit: 3 things to complete or correct");
    expect(html).toMatch(/<a href="#field-title">Title and summary, title<\/a>: Title is too short\./);
    expect(html).toMatch(/<a href="#section-reaction">Reaction, solvent<\/a>: Solvent is required/);
    // Row 651 is beyond the example's rows: the problem goes to the table as a whole.
    expect(html.indexOf("Title is too short")).toBeLessThan(html.indexOf("Not positive."));
  });
});

describe("DepositEditor", () => {
  it("renders a published version read-only, with its identifier and the cautions sentence", async () => {
    const { DepositEditor } = await import("@/components/deposit-editor/deposit-editor");
    const html = renderToStaticMarkup(
      h(
        QueryClientProvider,
        { client: new QueryClient() },
        h(DepositEditor, {
          mode: "existing",
          version: { id: 7, number: 1, state: "published", versionIdentifier: "10.5555/arrhenia.7.v1", retractionNotice: null },
          payload: EXAMPLE_DEPOSIT,
          lockVersion: 3,
          role: "owner",
          capabilities: versionCapabilities({ state: "published", siteRole: "researcher", datasetRole: "owner" }),
          checks: [{ code: "balanced", severity: "info", message: "Elements and charge balance." }],
          decisions: [
            { id: 1, decision: "accept", reason: "Clear and complete.", curator: "Curator One", createdAt: "2024-05-01T10:00:00.000Z" },
          ],
          members: [{ name: "Okafor, Maren", role: "owner" }],
        }),
      ),
    );
    expect(html).toContain("Version 1: published");
    expect(html).toContain("10.5555/arrhenia.7.v1");
    expect(html).toContain("Extrapolation outside the measured temperature range is unreliable");
    expect(html).toContain("Clear and complete.");
    expect(html).not.toContain("Save draft");
    expect(html).not.toContain("Submit for review");
    // A passed balance check is said plainly, never as a note.
    expect(html).toContain("Balanced: elements and charge.");
    expect(html).not.toContain("Elements and charge balance.");
    expect(html).not.toMatch(/>note<\/span>/);
  });

  it("renders a new deposit with the person as first creator and a save button", async () => {
    const { DepositEditor } = await import("@/components/deposit-editor/deposit-editor");
    const html = renderToStaticMarkup(
      h(
        QueryClientProvider,
        { client: new QueryClient() },
        h(DepositEditor, { mode: "new", person: { name: "Okafor, Maren", orcid: "0000-0002-1825-0097", affiliation: null } }),
      ),
    );
    expect(html).toContain("Save draft");
    expect(html).toContain('value="0000-0002-1825-0097"');
    expect(html).not.toContain("Submit for review");
    expect(html).toContain("Add at least two rows");
  });

  it("disables submitting a draft whose checks found an error, and says why", async () => {
    const { DepositEditor } = await import("@/components/deposit-editor/deposit-editor");
    const html = renderToStaticMarkup(
      h(
        QueryClientProvider,
        { client: new QueryClient() },
        h(DepositEditor, {
          mode: "existing",
          version: { id: 8, number: 1, state: "draft", versionIdentifier: null, retractionNotice: null },
          payload: EXAMPLE_DEPOSIT,
          lockVersion: 1,
          role: "owner",
          capabilities: versionCapabilities({ state: "draft", siteRole: "researcher", datasetRole: "owner" }),
          checks: [{ code: "unbalanced", severity: "error", message: "Hydrogen does not balance: 5 on the left, 4 on the right." }],
          decisions: [],
          members: [],
        }),
      ),
    );
    expect(html).toMatch(/<button type="button" class="btn-primary" disabled=""[^>]*aria-describedby="submit-blocked">Submit for review/);
    expect(html).toContain("Hydrogen does not balance");
    expect(html).toContain("Save draft");
  });
});

describe("LifecyclePanel after a return", () => {
  it("shows the conversation so far, read-only, beside the reply field", async () => {
    const { LifecyclePanel } = await import("@/components/deposit-editor/lifecycle-panel");
    const { returnConversation } = await import("@/lib/curation/conversation");
    const conversation = returnConversation(
      [
        {
          decision: "return",
          reason: "Second return: say how row 5 was checked.",
          curator: "Curator Two",
          createdAt: "2024-05-03T09:00:00.000Z",
        },
        {
          decision: "return",
          reason: "First return: the units of k are missing.",
          curator: "Curator One",
          createdAt: "2024-05-01T10:00:00.000Z",
        },
      ],
      [{ reply: "Units added to the k column.", submittedBy: "Okafor, Maren", createdAt: "2024-05-02T08:00:00.000Z" }],
    );
    const html = renderToStaticMarkup(
      h(LifecyclePanel, {
        version: { id: 9, number: 1, state: "returned", versionIdentifier: null, retractionNotice: null },
        role: "owner",
        capabilities: versionCapabilities({ state: "returned", siteRole: "researcher", datasetRole: "owner" }),
        checks: [],
        decisions: [],
        conversation,
        members: [],
        dirty: false,
        notReady: 0,
      }),
    );
    const reply = html.indexOf("Your reply to the curator");
    const heading = html.indexOf("The conversation so far");
    expect(reply).toBeGreaterThan(-1);
    expect(heading).toBeGreaterThan(reply);
    const order = [
      "First return: the units of k are missing.",
      "Units added to the k column.",
      "Second return: say how row 5 was checked.",
    ].map((text) => html.indexOf(text));
    expect(order.every((i) => i > heading)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    // Read-only: the reply being written is the only text field.
    expect(html.match(/<textarea/g)).toHaveLength(1);
  });

  it("keeps showing the authors their reply once the version is submitted again", async () => {
    const { LifecyclePanel } = await import("@/components/deposit-editor/lifecycle-panel");
    const { returnConversation } = await import("@/lib/curation/conversation");
    const conversation = returnConversation(
      [{ decision: "return", reason: "The units of k are missing.", curator: "Curator One", createdAt: "2024-05-01T10:00:00.000Z" }],
      [{ reply: "Units added to the k column.", submittedBy: "Okafor, Maren", createdAt: "2024-05-02T08:00:00.000Z" }],
    );
    const html = renderToStaticMarkup(
      h(LifecyclePanel, {
        version: { id: 9, number: 1, state: "submitted", versionIdentifier: null, retractionNotice: null },
        role: "owner",
        capabilities: versionCapabilities({ state: "submitted", siteRole: "researcher", datasetRole: "owner" }),
        checks: [],
        decisions: [],
        conversation,
        members: [],
        dirty: false,
        notReady: 0,
      }),
    );
    expect(html).toContain("The conversation so far");
    expect(html).toContain("Units added to the k column.");
    expect(html).not.toContain("<textarea");
  });
});

describe("DepositEditor markup", () => {
  it("has unique ids, and every label and description points at an element that exists", async () => {
    const { DepositEditor } = await import("@/components/deposit-editor/deposit-editor");
    const html = renderToStaticMarkup(
      h(
        QueryClientProvider,
        { client: new QueryClient() },
        h(DepositEditor, {
          mode: "existing",
          version: { id: 9, number: 2, state: "returned", versionIdentifier: null, retractionNotice: null },
          payload: EXAMPLE_DEPOSIT,
          lockVersion: 1,
          role: "owner",
          capabilities: versionCapabilities({ state: "returned", siteRole: "researcher", datasetRole: "owner" }),
          checks: [],
          decisions: [],
          members: [],
        }),
      ),
    );
    const ids = [...html.matchAll(/ id="([^"]+)"/g)].map((m) => m[1]);
    expect(ids.filter((id, i) => ids.indexOf(id) !== i)).toEqual([]);
    const targets = [
      ...[...html.matchAll(/ for="([^"]+)"/g)].map((m) => m[1]),
      ...[...html.matchAll(/aria-describedby="([^"]+)"/g)].flatMap((m) => m[1].split(" ")),
    ];
    expect(targets.length).toBeGreaterThan(50);
    expect(targets.filter((t) => !ids.includes(t))).toEqual([]);
  });
});

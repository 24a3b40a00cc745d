import type { Metadata } from "next";
import { publicPageMetadata } from "@/lib/page-metadata";
import { CAUTION, MAX_POINTS } from "@/lib/analyses/analyse-request";
import { endpointScopes } from "@/lib/auth/endpoint-scopes";
import { apiRateLimit, appUrl } from "@/lib/config";
import { RATE_LIMIT_DRAFT } from "@/lib/api/openapi";
import { ApiReference } from "./api-reference";
import { ANALYSIS_CONVENTIONS, CONSENSUS_CONVENTIONS } from "@/lib/kinetics/conventions";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { METHOD_CATEGORIES, PHASES, REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { CONSENSUS_SELECTION_RULES } from "@/lib/reactions/consensus-selection";
import { DEFAULT_LIMIT, MAX_LIMIT, MAX_QUERY_LENGTH } from "@/lib/search/params";
import { SEARCH_QUERY_RULES } from "@/lib/search/parse-query";
import { SEARCH_FACETS, SEARCH_FLAGS } from "@/lib/search/types";
import { ScrollRegion } from "@/components/scroll-region";

export async function generateMetadata(): Promise<Metadata> {
  return publicPageMetadata({
    title: "API",
    description:
      "The REST API for reading and depositing rate-constant datasets: endpoints, tokens, units and the conventions of the fits.",
    path: "/docs/api",
  });
}

const example = (base: string) => `curl -s ${base}/api/v1/analyses \\
  -H 'content-type: application/json' \\
  -d '{"order": 2, "units": {"k": "cm3 molecule-1 s-1", "T": "K"},
       "points": [{"T": 250, "k": 2.1e-15}, {"T": 300, "k": 6.4e-15}, {"T": 350, "k": 1.2e-14}]}'`;

/** Renders `code` spans written with backticks in the conventions. */
function Inline({ text }: { text: string }) {
  return (
    <>
      {text
        .split(/(`[^`]+`)/g)
        .map((part, i) => (part.startsWith("`") ? <code key={i}>{part.slice(1, -1)}</code> : <span key={i}>{part}</span>))}
    </>
  );
}

export default function ApiDocsPage() {
  return (
    <article className="max-w-4xl space-y-8">
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">API</h1>
        <p className="text-muted">
          JSON over HTTP. Errors are <code>application/problem+json</code> (RFC 9457) with a stable <code>type</code> and <code>code</code>{" "}
          (the list is under <a href="#problems">Problem types</a>); validation errors carry an <code>errors</code> list of JSON pointers
          (RFC 6901) and plain messages. Scripts authenticate with a personal token from Settings:{" "}
          <code>Authorization: Bearer arh_key_…</code>. The whole API is described as an OpenAPI 3.1 document at{" "}
          <a href="/api/v1/openapi.json">/api/v1/openapi.json</a>; the <a href="#reference">endpoint reference</a> below is rendered from
          it.
        </p>
        <nav aria-label="On this page">
          <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            {[
              ["scopes", "Tokens and scopes"],
              ["caching", "Caching and rate limits"],
              ["reference", "Endpoints"],
              ["problems", "Problem types"],
              ["analyses", "Analyses"],
              ["search", "Search"],
              ["consensus", "Consensus"],
              ["points", "Points"],
              ["exports", "Exports"],
              ["limits", "Body sizes and retries"],
              ["other", "Other endpoints"],
            ].map(([id, label]) => (
              <li key={id}>
                <a href={`#${id}`}>{label}</a>
              </li>
            ))}
          </ul>
        </nav>
      </header>

      <section className="space-y-3" aria-labelledby="scopes">
        <h2 id="scopes" className="text-2xl font-semibold">
          Tokens and scopes
        </h2>
        <p className="text-sm">
          A token carries one or more scopes, chosen when it is created: <code>deposit:read</code> (fetch what you may see, including your
          drafts, list your deposits, validate a document), <code>deposit:write</code> (create, replace, submit and withdraw your drafts;
          for curators also review decisions) and <code>admin</code> (people and roles; offered to admins only); <code>deposit:write</code>{" "}
          and <code>admin</code> include <code>deposit:read</code>. Tokens made before these names keep their rights (<code>read</code>{" "}
          became <code>deposit:read</code>, <code>deposit</code> became <code>deposit:write</code>). An endpoint answers 403 to a token
          without the scope it needs, even when the person holds the role; a revoked or unknown token is refused with 401 on every endpoint,
          public ones included. Ids in paths are whole numbers from 1 to 2147483647; anything else is 404.
        </p>
        <ScrollRegion label="Endpoints and their scopes">
          <table className="table text-sm">
            <thead>
              <tr>
                <th scope="col">Endpoint</th>
                <th scope="col">Scope</th>
                <th scope="col">Who</th>
              </tr>
            </thead>
            <tbody>
              {endpointScopes.map((e) => (
                <tr key={`${e.method} ${e.path}`}>
                  <td>
                    <code>
                      {e.method} {e.path}
                    </code>
                  </td>
                  <td>{e.scope ? <code>{e.scope}</code> : "none"}</td>
                  <td>{e.who}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      </section>

      <section className="space-y-3" aria-labelledby="caching">
        <h2 id="caching" className="text-2xl font-semibold">
          Caching and rate limits
        </h2>
        <p className="text-sm">
          Public reads (datasets, versions, points, analyses, reactions, species, classes, search and this API&apos;s document) send a
          strong <code>ETag</code> and <code>Cache-Control: public, max-age=60</code>; send the tag back as <code>If-None-Match</code> and
          an unchanged answer is <code>304 Not Modified</code> with no body. A draft&apos;s <code>GET /api/v1/versions/:id</code> carries
          its lock version as its ETag: replace it with <code>PUT</code> and <code>If-Match</code> set to that tag (412 when someone saved
          since, 428 without the header).
        </p>
        <p className="text-sm">
          Each client — a token&apos;s holder, or else the network address — may make {apiRateLimit().toLocaleString("en")} requests a
          minute. Every answer says how much is left, in the fields of {RATE_LIMIT_DRAFT} (IETF HTTPAPI working group):{" "}
          <code>RateLimit-Policy: &quot;api&quot;;q={apiRateLimit()};w=60</code> (quota per window of seconds) and{" "}
          <code>RateLimit: &quot;api&quot;;r=…;t=…</code> (requests left, seconds until the window resets). Past the limit the answer is 429
          (<code>rate_limited</code>) with <code>Retry-After</code> in seconds.
        </p>
      </section>

      <ApiReference base={appUrl()} />

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="analyses" className="inline text-2xl font-semibold">
            POST /api/v1/analyses
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <p>
            Fits posted points exactly as every deposited dataset is fitted. No sign-in; limited to 120 requests a minute per address; at
            most {MAX_POINTS.toLocaleString("en")} points and 12 MB per request. Nothing is stored.
          </p>
          <h3 className="font-semibold">Body</h3>
          <ul className="list-disc space-y-1 pl-6 text-sm">
            <li>
              <code>points</code>: list of <code>{"{ T, k, sigmaLnK? }"}</code> — temperature, rate constant, and optionally the standard
              uncertainty of ln k. Weights 1/σ² apply only when every point has one.
            </li>
            <li>
              <code>order</code>: 1, 2 or 3 (fixes the unit of k).
            </li>
            <li>
              <code>T0</code>: reference temperature of the modified Arrhenius term, K (default 298.15).
            </li>
            <li>
              <code>units</code>: <code>{"{ k?, T? }"}</code>; default the storage units (K; s⁻¹, cm³ molecule⁻¹ s⁻¹ or cm⁶ molecule⁻² s⁻¹
              by reaction order). k:{" "}
              {[1, 2, 3].map((o) => SUPPORTED_UNITS.rateConstant[o as 1 | 2 | 3].map((u) => u.id).join(", ")).join("; ")}. T:{" "}
              {SUPPORTED_UNITS.temperature.map((u) => u.id).join(", ")}.
            </li>
          </ul>
          <h3 className="font-semibold">Answer</h3>
          <p className="text-sm">
            200 with <code>{"{ units, analysis, caution }"}</code>: <code>analysis</code> holds <code>n</code>, <code>weighted</code>,{" "}
            <code>arrhenius</code>, <code>modifiedArrhenius</code>, <code>eyring</code>, <code>diagnostics</code>, <code>curvature</code>,{" "}
            <code>band</code> (50 temperatures) and <code>flags</code>. 422 for input that cannot be fitted, 413 for an oversized body, 429
            when rate limited (with <code>Retry-After</code>).
          </p>
          <p className="text-sm">
            Each fit carries <code>scaleFactor</code> (√(χ²/dof), weighted fits) and <code>residualSDLnK</code> beside{" "}
            <code>residualSD</code>, and per point <code>residuals</code> and <code>fitted</code> (ln k). <code>arrhenius.k298</code> says
            whether 298.15 K lies outside the data (<code>extrapolated</code>, <code>extrapolation</code>: side, kelvin, inverseTWidths)
            and, with <code>intervalOmitted</code>, when its limits are left out because it lies more than one width of the data in 1/T
            away; <code>diagnostics.model</code> names the fit the points are judged on; <code>arrhenius.kMid</code> is k at the middle of
            the measured range in 1/T, with its interval. <code>curvature</code> gives its degrees of freedom (<code>dfNum</code>,{" "}
            <code>dfDenom</code>); with <code>exact</code> the modified fit reproduces the data to their rounding, and <code>F</code> and{" "}
            <code>p</code> are null. Each flag has <code>code</code>, <code>severity</code>, <code>message</code> (kJ mol⁻¹, K),{" "}
            <code>points</code> where it concerns points, and <code>quantities</code>: the numbers of the message with their kind, to write
            it in other units.
          </p>
          <ScrollRegion label="Example request and response">
            <pre className="w-max min-w-full rounded-md border border-line bg-panel p-4 text-xs">{example(appUrl())}</pre>
          </ScrollRegion>
          <h3 className="font-semibold">Conventions</h3>
          <ul className="list-disc space-y-2 pl-6 text-sm">
            {ANALYSIS_CONVENTIONS.map((c, i) => (
              <li key={i}>
                <Inline text={c} />
              </li>
            ))}
          </ul>
          <h3 className="font-semibold">Conventions of the consensus (reaction pages)</h3>
          <p className="text-sm">
            A reaction&apos;s page combines its published datasets into one consensus expression and compares each dataset with the others.
            The model, in words:
          </p>
          <ul className="list-disc space-y-2 pl-6 text-sm">
            {CONSENSUS_CONVENTIONS.map((c, i) => (
              <li key={i}>
                <Inline text={c} />
              </li>
            ))}
          </ul>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{CAUTION}</p>
        </div>
      </details>

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="search" className="inline text-2xl font-semibold">
            GET /api/v1/search
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <p>
            Published datasets (and retracted ones, marked <code>retracted: true</code>) matching a text, a species or a reaction pattern
            and your filters; drafts, submissions and declined datasets never appear, not even in facet counts. Each dataset is listed by
            its newest public version. No sign-in. The <a href="/search">search page</a> takes the same parameters in its URL.
          </p>
          <h3 className="font-semibold">Query parameters</h3>
          <ul className="list-disc space-y-1 pl-6 text-sm">
            <li>
              <code>q</code>: what to look for, at most {MAX_QUERY_LENGTH} characters (read as below).
            </li>
            <li>
              <code>view</code>: <code>datasets</code> (default) or <code>reactions</code> (one row per reaction: <code>datasetCount</code>{" "}
              of the matching datasets that count as evidence and <code>retractedCount</code> of the retracted ones, found and marked but
              never in the count, the temperature range <code>tMin</code>–<code>tMax</code> (null when every match is retracted), the
              consensus expression over the reaction page&apos;s default choice, and the spread of the datasets&apos; own preferred fits;
              the consensus and the spread are the reaction&apos;s own, over every published dataset of it that is not retracted, whatever
              the search&apos;s filters: they describe the reaction, the counts and range describe the matches).
            </li>
            <li>
              <code>sort</code>: <code>relevance</code> (default; for a species or a reaction pattern, the newest first),{" "}
              <code>newest</code>, <code>widest</code> (temperature range), <code>points</code>; ties go to the newer version.
            </li>
            <li>
              <code>limit</code>: 1–{MAX_LIMIT}, default {DEFAULT_LIMIT}; <code>cursor</code>: the <code>nextCursor</code> of the previous
              page (signed and bound to its search: a changed one, or one from another search, is 400).
            </li>
            <li>
              Filters, each “any of” its values, all filters together: <code>class</code> ({REACTION_CLASSES.map((c) => c.id).join(", ")}),{" "}
              <code>phase</code> ({PHASES.map((c) => c.id).join(", ")}), <code>method</code> (
              {METHOD_CATEGORIES.map((c) => c.id).join(", ")}
              ), <code>licence</code> (SPDX ids), <code>flag</code> ({SEARCH_FLAGS.join(", ")}) — repeated or comma-separated;{" "}
              <code>bathGas</code> and <code>creator</code> — repeated (names may hold commas).
            </li>
            <li>
              <code>tMin</code>, <code>tMax</code> (K): datasets whose measured range overlaps the window; with <code>tCovers=true</code>{" "}
              (both bounds needed) only those whose range covers it whole. <code>pMin</code>, <code>pMax</code> (Pa): datasets with a stated
              pressure overlapping the window. <code>yearMin</code>, <code>yearMax</code>: year of the source publication. Bounds are
              non-negative plain numbers, the lower not above the upper.
            </li>
          </ul>
          <h3 className="font-semibold">How the text is read</h3>
          <ul className="list-disc space-y-2 pl-6 text-sm">
            {SEARCH_QUERY_RULES.map((c, i) => (
              <li key={i}>
                <Inline text={c} />
              </li>
            ))}
          </ul>
          <h3 className="font-semibold">Answer</h3>
          <p className="text-sm">
            200 with <code>{"{ query, parsed, understood, total, hits, facets, nextCursor, caution }"}</code>: <code>parsed</code> says in
            words what the text was understood as, <code>understood</code> the same as data; <code>total</code> counts datasets (or
            reactions) before paging; each dataset hit has its version, identifier, title, equation, reaction key, class, method,
            temperature range, points, the re-fit&apos;s <code>ea</code> (J mol⁻¹) and <code>a</code> (in <code>aUnit</code>, written as
            files write units: <code>cm3 molecule-1 s-1</code>), flags, creators and publication time; <code>facets</code> counts values of{" "}
            {SEARCH_FACETS.join(", ")} over the matches with every other facet&apos;s filter applied. Any parameter that cannot be read — an
            unknown one included — is 400 (<code>bad_request</code>) with an <code>errors</code> list naming each <code>parameter</code>, as
            for the consensus below.
          </p>
          <h3 className="font-semibold">GET /api/v1/search/suggest?q=</h3>
          <p className="text-sm">
            For a search box: up to 8 species (by name, synonym or formula prefix, then by similarity for typos) and up to 8 reactions whose
            equation or species names contain the text, from published data only, each with its own public dataset count (the same whatever
            was typed) and named by its display name:{" "}
            <code>
              {
                "{ species: [{ inchiKey, name, formula, matched, datasetCount }], reactions: [{ reactionId, reactionKey, equation, datasetCount }] }"
              }
            </code>
            .
          </p>
          <ScrollRegion label="Example search request">
            <pre className="w-max min-w-full rounded-md border border-line bg-panel p-4 text-xs">{`curl -s '${appUrl()}/api/v1/search?q=OH+%2B+CH4&method=experiment&tMin=250&tMax=400&sort=widest'`}</pre>
          </ScrollRegion>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{CAUTION}</p>
        </div>
      </details>

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="consensus" className="inline text-2xl font-semibold">
            GET /api/v1/reactions/:id/consensus
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <p>
            The consensus expression of one reaction, computed from the datasets your parameters choose, with the list of what went in and
            what did not, and why. The same choice and the same lists appear on the reaction page, where the choice lives in the page’s URL
            (the same parameters). No sign-in.
          </p>
          <h3 className="font-semibold">Query parameters</h3>
          <ul className="list-disc space-y-1 pl-6 text-sm">
            <li>
              <code>include</code>: <code>all</code> (default: measured and calculated), <code>measured</code> or <code>calculated</code>.
            </li>
            <li>
              <code>Tmin</code>, <code>Tmax</code>: the temperature window in kelvin, plain decimal numbers above zero, <code>Tmin</code>{" "}
              below <code>Tmax</code>; either may be left out.
            </li>
          </ul>
          <p className="text-sm">
            An empty value means “not set”. Names are case-sensitive; an unknown or repeated parameter, or a value that cannot be read, is
            refused with 400 (<code>bad_request</code>) and an <code>errors</code> list in which each entry names its <code>parameter</code>
            , a <code>pointer</code> to it (<code>/Tmin</code>), the <code>value</code> sent and a plain <code>message</code>. An unknown
            reaction, or one with no published data yet, is 404.
          </p>
          <h3 className="font-semibold">Answer</h3>
          <p className="text-sm">
            200 with <code>{"{ data: { reaction, units, selection, consensus, unavailable, caution } }"}</code>. <code>selection</code>{" "}
            holds the choice (<code>include</code>, <code>Tmin</code>, <code>Tmax</code>, <code>description</code>), the reaction{" "}
            <code>order</code>, <code>used</code> (each version with <code>kind</code>, <code>points</code>, <code>pointsUsed</code> and the
            temperatures used), <code>notUsed</code> (each with <code>reasons</code>: a stable <code>code</code> — <code>retracted</code>,{" "}
            <code>evaluated</code>, <code>unknown_method</code>, <code>not_chosen</code>, <code>excluded_by_curator</code>,{" "}
            <code>other_order</code>, <code>too_few_temperatures</code>, <code>outside_window</code>, <code>unit_suspect</code>,{" "}
            <code>off_consensus</code> — and a <code>message</code>) and <code>curatorExclusions</code> (version, reason, time).{" "}
            <code>consensus</code> is the engine’s result in the storage units named in (<code>units</code>); its <code>members[].id</code>{" "}
            are the version ids of <code>used</code>, as strings, plus those left out by a curator alone (compared, not fitted) and those it
            left out as a likely unit mistake. When no consensus can be formed, <code>consensus</code> is null and <code>unavailable</code>{" "}
            says why.
          </p>
          <h3 className="font-semibold">Which datasets go in</h3>
          <ul className="list-disc space-y-2 pl-6 text-sm">
            {CONSENSUS_SELECTION_RULES.map((c, i) => (
              <li key={i}>
                <Inline text={c} />
              </li>
            ))}
          </ul>
          <ScrollRegion label="Example consensus request">
            <pre className="w-max min-w-full rounded-md border border-line bg-panel p-4 text-xs">{`curl -s '${appUrl()}/api/v1/reactions/1/consensus?include=measured&Tmin=250&Tmax=400'`}</pre>
          </ScrollRegion>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{CAUTION}</p>
        </div>
      </details>

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="points" className="inline text-2xl font-semibold">
            GET /api/v1/versions/:id/points.csv and points.json
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <p>
            Every point of one published or retracted version, as its page’s “Download the points” links give them. No sign-in. Any other
            version (a draft, a submission, one in review, returned or declined) is 404 to everyone, its owner included (who reads a draft
            through <code>GET /api/v1/versions/:id</code>). <code>:id</code> is the version’s id, as in the other version endpoints.
          </p>
          <ul className="list-disc space-y-1 pl-6 text-sm">
            <li>
              <code>points.csv</code>: <code>text/csv; charset=utf-8; header=present</code>, lines ending in CRLF. First come <code>#</code>{" "}
              comment lines: version identifier, title, version and state, the retraction notice of a retracted version, licence, the
              citation line, the page’s address, the caution sentence and what the residuals are. Then one header row and one row per point:{" "}
              <code>row</code>, the deposited <code>T_deposited</code>, <code>k_deposited</code> with their units, the stated uncertainty (
              <code>uncertainty_kind</code> absolute, relative in percent or factor; <code>uncertainty_value</code>;{" "}
              <code>uncertainty_confidence</code> 1sigma or 2sigma), the deposited pressure and its unit, then the values converted to K,
              the molecule-based unit of k for the order and Pa: <code>T_K</code>, <code>k_s-1</code>, <code>k_cm3_molecule-1_s-1</code> or{" "}
              <code>k_cm6_molecule-2_s-1</code> (the column is named by its unit) and <code>k_unit</code> (that unit again, under a fixed
              name), <code>sigma_ln_k</code>, <code>pressure_Pa</code>, <code>bath_gas</code>, <code>residual_ln_k</code> (ln k − fitted ln
              k of the re-fit the page draws), <code>residual_in_sigma</code> (that residual over <code>sigma_ln_k</code>, weighted fits
              only), <code>outlier</code> and <code>influential</code> (<code>yes</code> or empty), <code>note</code>. Empty cells are
              missing values; text that a spreadsheet would take for a formula starts with an apostrophe.
            </li>
            <li>
              <code>points.json</code>: <code>application/json</code>,{" "}
              <code>
                {
                  "{ about: { versionIdentifier, title, version, state, retraction, licence, citation, landingPage, caution, units: { T, k, pressure }, residuals }, points: [ { row, deposited: { T, TUnit, k, kUnit, uncertainty, pressure, pressureUnit }, converted: { T, k, sigmaLnK, pressure }, bathGas, note, residualLnK, residualInSigma, findings: [ { code, reason } ] } ] }"
                }
              </code>
              .
            </li>
          </ul>
          <p className="text-sm">
            Both answer with <code>Content-Disposition: attachment</code> and a file name made of the version identifier’s code and number (
            <code>ARH-4F7K-9QXM-2-points.csv</code>).
          </p>
          <ScrollRegion label="Example points request">
            <pre className="w-max min-w-full rounded-md border border-line bg-panel p-4 text-xs">{`curl -sOJ '${appUrl()}/api/v1/versions/1/points.csv'`}</pre>
          </ScrollRegion>
        </div>
      </details>

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="exports" className="inline text-2xl font-semibold">
            Exports: mechanism parameters, a version as JSON, a whole search
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <ul className="list-disc space-y-1 pl-6 text-sm">
            <li>
              <code>GET /api/v1/datasets/:id/versions/:n/parameters</code> and <code>GET /api/v1/reactions/:key/parameters</code> (the
              consensus over <code>include</code>, <code>Tmin</code>, <code>Tmax</code>, as on the reaction page; <code>:key</code> as the
              reaction page’s address writes it): <code>format=table</code> (<code>text/plain</code>, every fit with A, n, Ea, T0 and A/T0
              <sup>n</sup>, the preferred one marked) or <code>format=cantera-yaml</code> (<code>application/yaml</code>: a{" "}
              <code>units</code> block and one elementary reaction with <code>rate-constant: {"{A, b, Ea}"}</code>, A already divided by T0
              <sup>n</sup> since Cantera writes T<sup>b</sup> without T0; <code>fit=preferred|arrhenius|modified_arrhenius</code> chooses
              the fit). Species are named by formula (<code>OH</code>, <code>CH4</code>; isomers sharing a formula get <code>-</code> and
              the first letters of their InChIKey, so two species never share a name), with a comment block mapping each name to its
              InChIKey and the depositor’s name; <code>names=deposited</code> names them by the depositor’s words instead. <code>k</code>:
              any rate-constant unit of the reaction’s order (default the molecule-based one); <code>energy</code>: <code>kJ mol-1</code>{" "}
              (default), <code>kcal mol-1</code>, <code>J mol-1</code>, <code>cal mol-1</code> or <code>K</code> (Ea/R). Files and API
              answers write units in ASCII (<code>cm3 molecule-1 s-1</code>), one spelling per unit; pages show them with superscripts. Both
              name the reaction, the temperature range, the identifier (or the datasets of the consensus) and the caution.
            </li>
            <li>
              <code>GET /api/v1/datasets/:id/versions/:n/export.json</code>:{" "}
              <code>{"{ about, document, analysis: { engineVersion, analysedAt, result, flags, checks } }"}</code> — the deposit document as
              stored with its newest re-fit.
            </li>
            <li>
              <code>GET /api/v1/search/export?format=csv|jsonl|json</code> with the parameters of <code>GET /api/v1/search</code> (not{" "}
              <code>limit</code> or <code>cursor</code>: the whole result, streamed as it is read). CSV opens with <code>#</code> lines (the
              search, units as plain text, where licences and citations are, the caution; each line one quoted cell); JSON lines with an{" "}
              <code>about</code> line; JSON is <code>{"{ about, hits: [ … ] }"}</code>. <code>bom=1</code> (CSV here and in{" "}
              <code>points.csv</code>) puts a UTF-8 byte order mark first, for spreadsheet programs.
            </li>
          </ul>
          <p className="text-sm">
            Drafts and every version that is not published or retracted are 404; a bad parameter is a 400 naming it.
          </p>
          <ScrollRegion label="Example parameters request">
            <pre className="w-max min-w-full rounded-md border border-line bg-panel p-4 text-xs">{`curl -sOJ '${appUrl()}/api/v1/datasets/1/versions/1/parameters?format=cantera-yaml&k=cm3%20mol-1%20s-1&energy=kcal%20mol-1'`}</pre>
          </ScrollRegion>
        </div>
      </details>

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="limits" className="inline text-2xl font-semibold">
            Body sizes and safe retries
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <p className="text-sm">
            Every request body is counted as it arrives, with or without <code>Content-Length</code>, and refused with 413 (
            <code>payload_too_large</code>) as soon as it crosses its limit: deposit documents 25 MB, supplementary files 25 MB, analyses 12
            MB, other JSON bodies 1 MB.
          </p>
          <p className="text-sm">
            <code>POST /api/v1/datasets</code>, <code>POST /api/v1/versions/:id/next</code>, <code>POST /api/v1/versions/:id/files</code>{" "}
            and <code>POST /api/v1/versions/:id/transitions</code> accept an <code>Idempotency-Key</code> header (1 to 255 visible ASCII
            characters, e.g. a fresh UUID, plain or in quotes). Send the same key again when retrying after a timeout: for 24 hours, the
            same key from the same account with the same body answers with the first response (same status and body, marked{" "}
            <code>Idempotent-Replayed: true</code>) and creates nothing new. The same key with another body is a 422; a retry while the
            first request is still running is a 409. Refused requests store nothing and keep no key, so they may be retried with it. Files
            are matched on name and content.
          </p>
        </div>
      </details>

      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="other" className="inline text-2xl font-semibold">
            Other endpoints
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <ul className="list-disc space-y-1 pl-6 text-sm">
            <li>
              <code>GET /api/health</code> — <code>{'{"status":"ok","database":"ok","databaseLatencyMs":2}'}</code> (one query through the
              app’s own connection pool, with its round-trip time), or 503 when that query fails or takes over 2 s.
            </li>
            <li>
              <code>GET</code> or <code>POST /oai</code> — harvesting by OAI-PMH 2.0 (POST with an{" "}
              <code>application/x-www-form-urlencoded</code> body): every published version is one record,{" "}
              <code>oai:&lt;host&gt;:&lt;version identifier&gt;</code>, in <code>oai_dc</code> or <code>oai_datacite</code> (the DataCite
              metadata of <code>datacite.xml</code>); sets are the reaction classes; <code>from</code>/<code>until</code> at day or second
              granularity, both inclusive; a record’s date moves when it is published, retracted or gains a newer version; a retracted
              version stays as a deleted record; lists come a page at a time with a signed resumption token that expires after a day. Start
              with <code>{`${appUrl()}/oai?verb=Identify`}</code>.
            </li>
            <li>
              <code>GET /reactions/&lt;reaction key&gt;/feed.xml</code> and <code>GET /classes/&lt;class&gt;/feed.xml</code> — Atom feeds
              (RFC 4287) of the reaction’s or the class’s versions: one entry when a version is published (a new version of a dataset says
              which it replaces) and one when it is retracted (with the reason), newest first, the last 100; entry ids never change, so a
              reader sees each event once. The numeric reaction id redirects to the key.
            </li>
            <li>
              <code>GET /api/v1/users</code> — everyone with an account (admins).
            </li>
            <li>
              <code>PATCH /api/v1/users/:id</code> — body <code>{"{ role?, active? }"}</code>; changes a role or deactivates an account
              (admins; audited).
            </li>
          </ul>
        </div>
      </details>
    </article>
  );
}

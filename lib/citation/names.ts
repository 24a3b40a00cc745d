/**
 * A creator's name as deposited ("Tanaka, Emi", "Emi Tanaka", "Rosalind van der Berg", "Kinetics
 * Consortium") → the parts every citation format needs: a person's family and given names (CSL
 * family/given, DataCite familyName/givenName with nameType Personal) or an organisation's one name
 * (CSL literal, DataCite nameType Organizational). Every format reads its names from here, so they
 * agree. The split is citation-js's own name parser (@citation-js/name). Pure.
 */
import { parse as parseName } from "@citation-js/name";

export type CreatorName =
  { kind: "person"; family: string; given?: string; particle?: string; suffix?: string } | { kind: "organisation"; name: string };

/**
 * Words that mark an organisation's name rather than a person's (common practice: the words
 * research groups, institutes and collaborations name themselves with). Matched as whole words,
 * case-insensitively.
 */
const ORGANISATION_WORDS = [
  "academy",
  "agency",
  "association",
  "centre",
  "center",
  "collaboration",
  "committee",
  "consortium",
  "corporation",
  "council",
  "department",
  "facility",
  "foundation",
  "gmbh",
  "group",
  "inc",
  "institut",
  "institute",
  "laboratories",
  "laboratory",
  "ltd",
  "ministry",
  "network",
  "observatory",
  "office",
  "programme",
  "program",
  "project",
  "school",
  "society",
  "survey",
  "team",
  "universidad",
  "universität",
  "université",
  "university",
];
const ORGANISATION = new RegExp(`(^|[^\\p{L}])(${ORGANISATION_WORDS.join("|")})($|[^\\p{L}])`, "iu");

/** Whether a deposited name is an organisation's (a word such as Consortium, Institute, Group in it). */
export function isOrganisationName(name: string): boolean {
  return ORGANISATION.test(name);
}

/**
 * The parts of one deposited name.
 *
 * @example creatorName("Emi Tanaka") // { kind: "person", family: "Tanaka", given: "Emi" }
 * @example creatorName("Kinetics Consortium") // { kind: "organisation", name: "Kinetics Consortium" }
 */
export function creatorName(deposited: string): CreatorName {
  // A stray comma at either end ("Bo,") is no separator.
  const text = deposited.replace(/\s+/g, " ").replace(/^[\s,]+|[\s,]+$/g, "");
  if (isOrganisationName(text)) return { kind: "organisation", name: text };
  const parsed = parseName(text) as { family?: string; given?: string; "non-dropping-particle"?: string; suffix?: string };
  if (!parsed.family) return { kind: "organisation", name: text };
  return {
    kind: "person",
    family: parsed.family,
    ...(parsed.given ? { given: parsed.given } : {}),
    ...(parsed["non-dropping-particle"] ? { particle: parsed["non-dropping-particle"] } : {}),
    ...(parsed.suffix ? { suffix: parsed.suffix } : {}),
  };
}

/** A person's family name with its particle ("van der Berg"), as DataCite's familyName holds it. */
export function familyWithParticle(name: Extract<CreatorName, { kind: "person" }>): string {
  return [name.particle, name.family].filter(Boolean).join(" ");
}

/** The name in citation order: "Tanaka, Emi", "van der Berg, Rosalind", "Smith, John, Jr."; an organisation's as given. */
export function sortedNameText(name: CreatorName): string {
  if (name.kind === "organisation") return name.name;
  return [familyWithParticle(name), name.given, name.suffix].filter(Boolean).join(", ");
}

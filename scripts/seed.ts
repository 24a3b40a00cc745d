// Seeds the invented demo scenario once: a second run adds nothing twice.
import { seedsDemoDatasets } from "@/lib/config";
import { seedDemo, demoAccounts } from "./seed/seed-data";
import { seedDemoDatasets } from "./seed/seed-datasets";
import { seedDemoCollection } from "./seed/seed-collections";
import { seedDemoRevision } from "./seed/seed-revisions";

const created = await seedDemo();
console.log(`[arrhenia] demo seed: ${created} new account(s), ${demoAccounts.length - created} already present`);
if (seedsDemoDatasets()) {
  const made = await seedDemoDatasets();
  console.log(made ? `[arrhenia] demo seed: ${made} datasets` : "[arrhenia] demo seed: datasets already present");
  if (await seedDemoRevision()) console.log("[arrhenia] demo seed: a second version of one dataset");
  if (await seedDemoCollection()) console.log("[arrhenia] demo seed: one published collection");
}
process.exit(0);

// Seeds the invented demo scenario once: a second run adds nothing twice.
import { seedDemo, demoAccounts } from "@/db/seed-data";
import { seedDemoDatasets } from "@/db/seed-datasets";

const created = await seedDemo();
console.log(`[arrhenia] demo seed: ${created} new account(s), ${demoAccounts.length - created} already present`);
if (process.env.SEED_DATASETS !== "0") {
  const made = await seedDemoDatasets();
  console.log(made ? `[arrhenia] demo seed: ${made} datasets` : "[arrhenia] demo seed: datasets already present");
}
process.exit(0);

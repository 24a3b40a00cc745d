// Seeds the invented demo scenario once: a second run adds nothing twice.
import { seedDemo, demoAccounts } from "@/db/seed-data";

const created = await seedDemo();
console.log(`[arrhenia] demo seed: ${created} new account(s), ${demoAccounts.length - created} already present`);
process.exit(0);

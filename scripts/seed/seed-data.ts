import "server-only";
import { hashPassword } from "@/lib/auth/password";
import { createUser, getUserByEmail } from "@/lib/users/queries";
import type { Role } from "@/db/users";

/** Invented demo people and groups; every name, group and address here is fictional. */
export const DEMO_PASSWORD = "arrhenia-demo";

export const demoAccounts: { email: string; name: string; role: Role; affiliation: string; orcid: string | null }[] = [
  { email: "admin@demo.arrhenia.invalid", name: "Rosalind Okafor", role: "admin", affiliation: "Arrhenia operations", orcid: null },
  {
    email: "curator.hale@demo.arrhenia.invalid",
    name: "Ingrid Hale",
    role: "curator",
    affiliation: "Arrhenia curation board",
    orcid: null,
  },
  {
    email: "curator.mensah@demo.arrhenia.invalid",
    name: "Kofi Mensah",
    role: "curator",
    affiliation: "Arrhenia curation board",
    orcid: null,
  },
  {
    email: "tanaka@demo.arrhenia.invalid",
    name: "Emi Tanaka",
    role: "researcher",
    affiliation: "Flash Photolysis Laboratory, Lakeside Institute of Technology (gas kinetics)",
    orcid: null,
  },
  {
    email: "varga@demo.arrhenia.invalid",
    name: "Bence Varga",
    role: "researcher",
    affiliation: "Flash Photolysis Laboratory, Lakeside Institute of Technology (gas kinetics)",
    orcid: null,
  },
  {
    email: "lindqvist@demo.arrhenia.invalid",
    name: "Sara Lindqvist",
    role: "researcher",
    affiliation: "Reaction Theory Group, Northmoor University (ab initio kinetics)",
    orcid: null,
  },
  {
    email: "adeyemi@demo.arrhenia.invalid",
    name: "Tunde Adeyemi",
    role: "researcher",
    affiliation: "Reaction Theory Group, Northmoor University (ab initio kinetics)",
    orcid: null,
  },
];

/** Returns how many accounts were created this time. */
export async function seedDemo(): Promise<number> {
  let created = 0;
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const a of demoAccounts) {
    if (await getUserByEmail({ email: a.email })) continue;
    await createUser({ ...a, passwordHash, verified: true });
    created++;
  }
  return created;
}

import Link from "next/link";
import type { Creator } from "@/lib/deposits/types";
import { OrcidId } from "./orcid-id";

/**
 * A version's creators as deposited; an entry linked to a person (creator_people) links to their
 * profile with the verified iD, and an iD only typed into the deposit says "not verified".
 */
export function CreatorList({ creators, people }: { creators: Creator[]; people: ReadonlyMap<number, { userId: number; orcid: string }> }) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
      {creators.map((c, position) => {
        const person = people.get(position);
        return (
          <li key={position}>
            {person ? <Link href={`/people/${person.userId}`}>{c.name}</Link> : c.name}
            {person ? (
              <>
                {" "}
                <OrcidId orcid={person.orcid} verified />
              </>
            ) : c.orcid ? (
              <>
                {" "}
                <OrcidId orcid={c.orcid} verified={false} />
              </>
            ) : null}
          </li>
        );
      })}
    </ul>
  );
}

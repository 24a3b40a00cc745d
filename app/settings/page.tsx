import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { DateTime } from "@/components/date-time";
import { OrcidId } from "@/components/orcid-id";
import { OrcidButton } from "@/app/sign-in/orcid-button";
import { orcidMessage } from "@/app/sign-in/orcid-messages";
import { can } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import { getPublicProfile } from "@/lib/people/queries";
import { listApiTokens } from "@/lib/users/queries";
import {
  ChoosePasswordButton,
  CreateTokenForm,
  PasswordForm,
  ProfileForm,
  ProfileListingForm,
  RevokeTokenButton,
  UnlinkOrcidButton,
} from "./settings-forms";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage({ searchParams }: { searchParams: Promise<{ orcid?: string | string[] }> }) {
  const { orcid: orcidOutcome } = await searchParams;
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/settings");
  const [tokens, profile] = await Promise.all([listApiTokens({ userId: user.id }), getPublicProfile({ id: user.id })]);
  return (
    <div className="space-y-8">
      <header>
        <h1 className="text-3xl font-semibold">Settings</h1>
        <p className="text-sm text-muted">
          Signed in as {user.email} ({user.role}).
        </p>
        <p className="text-sm">
          <Link href="/watches">What you watch</Link>: the reactions, species and datasets you hear about by mail.
        </p>
      </header>
      <div className="grid gap-6 md:grid-cols-2">
        <section aria-labelledby="profile-heading" className="card space-y-4">
          <h2 id="profile-heading" className="text-xl font-semibold">
            Profile
          </h2>
          <ProfileForm name={user.name} orcid={user.orcid} affiliation={user.affiliation} />
        </section>
        <section aria-labelledby="password-heading" className="card space-y-4">
          <h2 id="password-heading" className="text-xl font-semibold">
            Password
          </h2>
          {user.passwordSet ? (
            <PasswordForm />
          ) : (
            <>
              <p className="text-sm">
                Your account has no password yet: you sign in with ORCID. To sign in with your e-mail address too, choose one through a link
                we mail you.
              </p>
              <ChoosePasswordButton />
            </>
          )}
        </section>
      </div>
      <section aria-labelledby="orcid-heading" className="card space-y-4">
        <h2 id="orcid-heading" className="text-xl font-semibold">
          ORCID and public profile
        </h2>
        {orcidOutcome === "linked" && (
          <p role="status" className="rounded-md border border-ok/40 px-3 py-2 text-sm text-ok">
            Your ORCID iD is linked. Datasets naming it as a creator now list you.
          </p>
        )}
        {orcidMessage(orcidOutcome) && (
          <p role="alert" className="rounded-md border border-error/40 px-3 py-2 text-sm text-error">
            {orcidMessage(orcidOutcome)}
          </p>
        )}
        {user.verifiedOrcid ? (
          <>
            <p className="text-sm">
              Linked iD: <OrcidId orcid={user.verifiedOrcid} verified />. You can sign in with it, and every dataset naming it as a creator
              is on your profile.
            </p>
            {user.passwordSet ? (
              <UnlinkOrcidButton />
            ) : (
              <p className="text-sm text-muted">
                Your account has no password yet: choose one (in the Password box above) before unlinking ORCID, or you could no longer sign
                in.
              </p>
            )}
          </>
        ) : (
          <>
            <p className="text-sm">
              No ORCID iD is linked.
              {user.orcid && (
                <>
                  {" "}
                  The iD you typed, <OrcidId orcid={user.orcid} verified={false} />, is shown as not verified until you link it.
                </>
              )}
            </p>
            <div className="max-w-xs">
              <OrcidButton callbackUrl="/settings" label="Link my ORCID iD" />
            </div>
          </>
        )}
        {profile && (
          <p className="text-sm">
            Your public profile: <Link href={`/people/${user.id}`}>/people/{user.id}</Link> (your e-mail address is never shown).
          </p>
        )}
        <ProfileListingForm listed={user.profileListed} />
      </section>
      <section aria-labelledby="tokens-heading" className="card space-y-4">
        <h2 id="tokens-heading" className="text-xl font-semibold">
          Personal API tokens
        </h2>
        <p className="text-sm text-muted">
          Scripts use a token as <code>Authorization: Bearer …</code>. The secret is shown once, when you create it; we keep only a hash.
        </p>
        <CreateTokenForm canAdmin={can(user.role, "user.manage")} />
        {tokens.length > 0 && (
          <table className="table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Starts with</th>
                <th scope="col">Scopes</th>
                <th scope="col">Created</th>
                <th scope="col">Last used</th>
                <th scope="col">State</th>
              </tr>
            </thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={t.id}>
                  <td>{t.name}</td>
                  <td className="font-mono text-xs">{t.prefix}…</td>
                  <td>{t.scopes.join(", ")}</td>
                  <td>
                    <DateTime value={t.createdAt} />
                  </td>
                  <td>
                    <DateTime value={t.lastUsedAt} />
                  </td>
                  <td>{t.revokedAt ? <span className="text-muted">revoked</span> : <RevokeTokenButton tokenId={t.id} name={t.name} />}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}

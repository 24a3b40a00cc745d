/**
 * What the sign-in page (and settings) say for each way an ORCID sign-in or link can stop. The
 * codes are next-auth's own (OAuthSignin, OAuthCallback, Callback) and ours (Orcid…). Each says
 * that nothing was changed, since nothing was.
 */
export const ORCID_MESSAGES: Record<string, string> = {
  OrcidCancelled: "You cancelled at ORCID, so nothing was changed.",
  OrcidProviderError: "ORCID reported an error and did not confirm your iD. Nothing was changed; try again in a moment.",
  OAuthSignin: "The ORCID sign-in could not start: the ORCID service did not answer. Nothing was changed; try again later.",
  OAuthCallback:
    "The answer from ORCID did not match the sign-in this browser started (it came from another browser or tab, or too late). Nothing was changed; start again.",
  Callback: "The ORCID sign-in could not be completed. Nothing was changed; start again.",
  OrcidNotAnId: "ORCID did not give a valid iD. Nothing was changed.",
  OrcidAccountDeactivated: "The account linked to this ORCID iD has been deactivated. Write to an administrator.",
  OrcidLinkedElsewhere: "This ORCID iD is already linked to another Arrhenia account, so it was not linked to yours. Nothing was changed.",
};

export function orcidMessage(code: string | string[] | undefined): string | null {
  const c = Array.isArray(code) ? code[0] : code;
  return c && Object.hasOwn(ORCID_MESSAGES, c) ? ORCID_MESSAGES[c] : null;
}

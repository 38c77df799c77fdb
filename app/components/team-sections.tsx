import { Form, useActionData, useNavigation } from "react-router";
import { Field, FormError, Notice, SelectField } from "~/components/forms";
import type { MembersTeamData, TeamActionResult } from "~/services/team-forms.server";
import { PROJECT_ROLES } from "~/utils/permissions";

const roleOptions = PROJECT_ROLES.map((r) => ({ value: r, label: r }));
const when = (iso: string | null) => (iso ? iso.replace("T", " ").slice(0, 16) : "—");

/** The members page's team sections for owners: invitations by e-mail and share links for coauthors. */
export function TeamSections({ team }: { team: MembersTeamData }) {
  const result = useActionData() as TeamActionResult | undefined;
  const busy = useNavigation().state !== "idle";
  const mine = (intents: string[]) => (result?.team && intents.includes(result.team.intent) ? result : undefined);
  const inv = mine(["invite", "revoke-invitation"]);
  const share = mine(["create-share-link", "revoke-share-link"]);
  return (
    <>
      <section className="card space-y-3" aria-labelledby="invitations-heading">
        <h2 id="invitations-heading" className="font-bold">Invite by e-mail</h2>
        <p className="text-xs text-muted">The person receives a link that works once, for 7 days, and joins with the role you choose.</p>
        <FormError error={inv?.errors.form} />
        {inv?.team?.notice ? <Notice>{inv.team.notice}</Notice> : null}
        <Form method="post" className="space-y-3" noValidate>
          <input type="hidden" name="intent" value="invite" />
          <Field label="E-mail" name="email" id="invite-email" type="email" required error={inv?.errors.email} />
          <SelectField label="Role" name="role" id="invite-role" options={roleOptions} defaultValue="viewer" error={inv?.errors.role} />
          <button type="submit" className="btn-primary" disabled={busy}>Send invitation</button>
        </Form>
        {team.invitations.length ? (
          <table className="table" data-testid="pending-invitations">
            <thead>
              <tr><th>E-mail</th><th>Role</th><th>Until</th><th /></tr>
            </thead>
            <tbody>
              {team.invitations.map((i) => (
                <tr key={i.id}>
                  <td>{i.email}</td>
                  <td>{i.role}</td>
                  <td className="num text-muted">{i.state === "expired" ? "expired" : when(i.expiresAt).slice(0, 10)}</td>
                  <td className="text-right">
                    <Form method="post">
                      <input type="hidden" name="intent" value="revoke-invitation" />
                      <input type="hidden" name="invitationId" value={i.id} />
                      <button className="btn-danger" type="submit" disabled={busy}>Withdraw</button>
                    </Form>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : (
          <p className="text-xs text-muted">No pending invitations.</p>
        )}
      </section>

      <section className="card space-y-3" aria-labelledby="share-heading">
        <h2 id="share-heading" className="font-bold">Share links</h2>
        <p className="text-xs text-muted">
          A read-only link for coauthors: the overview, the ledger, the pathway diagrams, the audit and the export, without signing in.
        </p>
        <FormError error={share?.errors.form} />
        {share?.team?.shareUrl ? (
          <div className="rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm">
            <p className="mb-1 text-ok">Copy the link now; it is not shown again.</p>
            <input className="input num" readOnly value={share.team.shareUrl} data-testid="new-share-url" onFocus={(e) => e.currentTarget.select()} aria-label="New share link" />
          </div>
        ) : null}
        {share?.team?.notice ? <Notice>{share.team.notice}</Notice> : null}
        <Form method="post" className="space-y-3" noValidate>
          <input type="hidden" name="intent" value="create-share-link" />
          <Field label="Label (who it is for)" name="label" id="share-label" required error={share?.errors.label} />
          <SelectField
            label="Shows"
            name="snapshotId"
            id="share-snapshot"
            options={[{ value: "", label: "the live project" }, ...team.snapshots.map((s) => ({ value: String(s.id), label: `snapshot #${s.id} (${when(s.signedAt)}, ${s.signer})` }))]}
            error={share?.errors.snapshotId}
          />
          <Field label="Expires (optional)" name="expiresAt" id="share-expires" type="date" error={share?.errors.expiresAt} />
          <button type="submit" className="btn-primary" disabled={busy}>Create link</button>
        </Form>
        {team.shareLinks.length ? (
          <table className="table" data-testid="share-links">
            <thead>
              <tr><th>Label</th><th>Shows</th><th>State</th><th>Last used</th><th /></tr>
            </thead>
            <tbody>
              {team.shareLinks.map((l) => (
                <tr key={l.id}>
                  <td>{l.label}</td>
                  <td>{l.snapshotId ? `snapshot #${l.snapshotId}` : "live"}</td>
                  <td>{l.state === "active" && l.expiresAt ? `until ${l.expiresAt.slice(0, 10)}` : l.state}</td>
                  <td className="num text-muted">{when(l.lastUsedAt)}</td>
                  <td className="text-right">
                    {l.state === "revoked" ? null : (
                      <Form method="post">
                        <input type="hidden" name="intent" value="revoke-share-link" />
                        <input type="hidden" name="shareLinkId" value={l.id} />
                        <button className="btn-danger" type="submit" disabled={busy}>Revoke</button>
                      </Form>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
      </section>
    </>
  );
}

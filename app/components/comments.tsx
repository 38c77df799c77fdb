import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useRevalidator } from "react-router";
import { apiFetch, describeApiError } from "./api-client";
import { useProject } from "./use-project";

/**
 * Comments on audit findings and reactions, and the auditor's "accepted, because …" on a finding.
 * Members other than viewers comment (permission `comment`); auditors and owners accept (`review`).
 * Everything goes through GET/POST /api/v1/projects/:id/comments and …/findings/accept; the server
 * refuses what the role may not do, whatever the page shows.
 */
type CommentView = { id: number; author: string; body: string; createdAt: string };
type AcceptanceView = { acceptedBy: string; reason: string; createdAt: string };

const when = (iso: string) => iso.slice(0, 16).replace("T", " ");

export function CommentList({ comments }: { comments: CommentView[] }) {
  if (!comments.length) return null;
  return (
    <ul className="mt-1 space-y-1 border-l-2 border-rule pl-3" data-testid="comments">
      {comments.map((c) => (
        <li key={c.id}>
          <span className="font-medium">{c.author}</span> <span className="text-xs text-muted">{when(c.createdAt)}</span>
          <p className="whitespace-pre-line">{c.body}</p>
        </li>
      ))}
    </ul>
  );
}

/** A one-line form that posts JSON to the API and reports the error in place. */
function InlineForm({ label, placeholder, submit, onDone }: { label: string; placeholder: string; submit: (text: string) => Promise<unknown>; onDone: () => void }) {
  const [text, setText] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <form
      className="mt-1 flex flex-wrap items-start gap-2"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        setError(null);
        try {
          await submit(text);
          setText("");
          onDone();
        } catch (err) {
          setError(describeApiError(err));
        } finally {
          setBusy(false);
        }
      }}
    >
      <input className="input min-w-48 flex-1" value={text} onChange={(e) => setText(e.target.value)} placeholder={placeholder} aria-label={label} />
      <button className="btn" type="submit" disabled={busy}>
        {label}
      </button>
      {error ? <p className="field-error basis-full" role="alert">{error}</p> : null}
    </form>
  );
}

/** Under an audit finding: its acceptance, its comments, and the forms the role may use. */
export function FindingReview({ finding }: { finding: { key: string; acceptance: AcceptanceView | null; comments: CommentView[] } }) {
  const { project, can } = useProject();
  const revalidator = useRevalidator();
  const base = `/api/v1/projects/${project.id}`;
  const done = () => void revalidator.revalidate();
  return (
    <div className="basis-full text-sm" data-finding-key={finding.key}>
      {finding.acceptance ? (
        <p className="text-ok" data-testid="finding-accepted">
          Accepted by {finding.acceptance.acceptedBy} ({when(finding.acceptance.createdAt)}): {finding.acceptance.reason}
          {can.review ? (
            <button
              type="button"
              className="link ml-2 text-xs"
              onClick={async () => {
                await apiFetch(`${base}/findings/accept`, { method: "DELETE", body: { findingKey: finding.key } }).catch(() => undefined);
                done();
              }}
            >
              withdraw
            </button>
          ) : null}
        </p>
      ) : null}
      <CommentList comments={finding.comments} />
      {can.comment ? (
        <InlineForm
          label="Comment"
          placeholder="Comment on this finding"
          submit={(body) => apiFetch(`${base}/comments`, { body: { targetType: "finding", targetKey: finding.key, body } })}
          onDone={done}
        />
      ) : null}
      {can.review && !finding.acceptance ? (
        <InlineForm
          label="Accept"
          placeholder="Why this finding is acceptable"
          submit={(reason) => apiFetch(`${base}/findings/accept`, { body: { findingKey: finding.key, reason } })}
          onDone={done}
        />
      ) : null}
    </div>
  );
}

/** The comments on one reaction (the reaction breakdown shows them). */
export function ReactionComments({ reactionId }: { reactionId: number }) {
  const { project, can } = useProject();
  const queryClient = useQueryClient();
  const key = ["comments", project.id, "reaction", reactionId];
  const { data } = useQuery({
    queryKey: key,
    queryFn: () => apiFetch<{ comments: CommentView[] }>(`/api/v1/projects/${project.id}/comments?targetType=reaction&targetKey=${reactionId}`),
  });
  return (
    <section className="mt-3" data-testid="reaction-comments">
      <h4 className="font-bold">Comments</h4>
      {data && !data.comments.length ? <p className="text-xs text-muted">No comments yet.</p> : null}
      <CommentList comments={data?.comments ?? []} />
      {can.comment ? (
        <InlineForm
          label="Comment"
          placeholder="Comment on this reaction"
          submit={(body) => apiFetch(`/api/v1/projects/${project.id}/comments`, { body: { targetType: "reaction", targetKey: reactionId, body } })}
          onDone={() => void queryClient.invalidateQueries({ queryKey: key })}
        />
      ) : null}
    </section>
  );
}

import { useState } from 'react';
import type { CommentResponse, CommentsResponse, CommentTargetKind, CommentView } from '../../lib/api/handoff';
import { callApi } from '../../lib/api/client';
import { formatDayAndTime } from '../date-words';

interface Target {
  kind: CommentTargetKind;
  id?: string;
  label: string;
}

function ReplyBox({ onSend, label }: { onSend: (body: string) => Promise<string | null>; label: string }) {
  const [text, setText] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');
  async function send() {
    setBusy(true);
    const problem = await onSend(text);
    setBusy(false);
    if (problem) setError(problem);
    else {
      setText('');
      setError('');
    }
  }
  return (
    <div className="mt-2 space-y-1">
      <textarea className="field w-full" rows={2} aria-label={label} value={text} maxLength={5000} onChange={(event) => setText(event.target.value)} />
      <button type="button" className="button button-quiet py-1 text-sm" disabled={busy || text.trim() === ''} onClick={send}>
        {busy ? 'Sending…' : label}
      </button>
      {error && (
        <p className="error-text" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}

function Comment({ comment, depth, onReply }: { comment: CommentView; depth: number; onReply: (parent: CommentView, body: string) => Promise<string | null> }) {
  const [replying, setReplying] = useState(false);
  return (
    <li className={depth > 0 ? 'mt-2 border-l-2 border-rule pl-3' : 'panel p-3'} data-testid="comment">
      <p className="text-xs text-ink-soft">
        <span className="font-semibold text-ink">{comment.author?.name ?? 'A former member'}</span> on {comment.about} · {formatDayAndTime(comment.createdAt)}
      </p>
      <p className="mt-1 whitespace-pre-wrap text-sm">{comment.body}</p>
      {comment.replies.length > 0 && (
        <ul>
          {comment.replies.map((reply) => (
            <Comment key={reply.id} comment={reply} depth={depth + 1} onReply={onReply} />
          ))}
        </ul>
      )}
      {replying ? (
        <ReplyBox label="Send the answer" onSend={async (body) => {
          const problem = await onReply(comment, body);
          if (!problem) setReplying(false);
          return problem;
        }} />
      ) : (
        <button type="button" className="mt-1 text-xs font-semibold text-spruce-700" onClick={() => setReplying(true)}>
          Answer
        </button>
      )}
    </li>
  );
}

/**
 * The team's comment threads on a study, with a box to comment on the study, an item or an audit
 * and an "Answer" under each comment (members).
 */
export default function CommentThreads({ studyId, initial, targets }: { studyId: string; initial: CommentsResponse; targets: Target[] }) {
  const [threads, setThreads] = useState(initial.threads);
  const [target, setTarget] = useState(0);

  async function reload() {
    const result = await callApi<CommentsResponse>('GET', `/api/studies/${studyId}/comments`);
    if (result.ok) setThreads(result.data.threads);
  }
  async function post(body: unknown): Promise<string | null> {
    const result = await callApi<CommentResponse>('POST', `/api/studies/${studyId}/comments`, body);
    if (!result.ok) return result.error.message;
    await reload();
    return null;
  }
  const chosen = targets[target] ?? targets[0];

  return (
    <div className="space-y-3" data-testid="comment-threads">
      {threads.length === 0 ? <p className="empty-state">No comment yet.</p> : (
        <ul className="space-y-2">
          {threads.map((comment) => (
            <Comment key={comment.id} comment={comment} depth={0} onReply={(parent, body) => post({ parentId: parent.id, body })} />
          ))}
        </ul>
      )}
      <div className="panel p-3">
        <label className="label block text-sm" htmlFor="comment-target">
          Comment on
        </label>
        <select id="comment-target" className="field mb-1" value={target} onChange={(event) => setTarget(Number(event.target.value))}>
          {targets.map((option, index) => (
            <option key={`${option.kind}-${option.id ?? ''}`} value={index}>
              {option.label}
            </option>
          ))}
        </select>
        <ReplyBox label="Post the comment" onSend={(body) => post({ target: { kind: chosen.kind, id: chosen.id }, body })} />
      </div>
    </div>
  );
}

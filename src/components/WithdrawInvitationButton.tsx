import { useState } from 'react';
import { teamsApi } from '../lib/api/teams';

/** Withdraws an open invitation (its link stops working). */
export default function WithdrawInvitationButton({ teamId, invitationId, email }: { teamId: string; invitationId: string; email: string }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');
  return (
    <span className="inline-flex items-center gap-2">
      <button
        type="button"
        className="text-sm font-semibold text-brick-700 hover:underline disabled:opacity-60"
        disabled={busy}
        aria-label={`Withdraw the invitation to ${email}`}
        onClick={async () => {
          setBusy(true);
          const result = await teamsApi.withdrawInvitation(teamId, invitationId);
          if (result.ok) location.reload();
          else {
            setBusy(false);
            setError(result.error.message);
          }
        }}
      >
        Withdraw
      </button>
      {error && <span className="error-text" role="alert">{error}</span>}
    </span>
  );
}

import { useState } from 'react';
import { signOut } from '../lib/api/auth';

/** Signs out through Auth.js (a POST with its CSRF token). */
export default function SignOutButton() {
  const [busy, setBusy] = useState(false);
  return (
    <button
      type="button"
      className="text-sm font-semibold text-spruce-700 hover:underline disabled:opacity-60"
      disabled={busy}
      onClick={() => {
        setBusy(true);
        void signOut();
      }}
    >
      Sign out
    </button>
  );
}

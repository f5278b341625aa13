/** Where to go after signing in: see src/lib/safe-path.ts (shared with the sign-in form). */
export { safeNextPath } from '../safe-path';

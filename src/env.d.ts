/// <reference types="astro/client" />
/// <reference types="auth-astro/module" />

declare namespace App {
  interface Locals {
    /** The signed-in user with their memberships (null for anonymous callers). */
    user: import('./lib/server/current-user').CurrentUser | null;
    /** How the caller was authenticated. */
    authVia: 'session' | 'token' | null;
    /** Set when credentials were sent but not accepted. */
    authProblem: 'token-not-recognised' | null;
  }
}

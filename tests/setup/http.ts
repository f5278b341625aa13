/**
 * Talking to the test server like a browser or a script would: the client of `http-client.ts`
 * (cookie jar, Origin header, sign-in through Auth.js, bearer tokens) addressed to the shared test
 * server by default, and the helpers of the API tests (invitations, members, unique addresses).
 */
import { inject } from 'vitest';
import { demoPassword, HttpClient, signInSucceeded } from './http-client';

export { demoEmails, demoPassword, HttpClient, signInSucceeded, type CallOptions } from './http-client';

/** Fixed ids of the seeded demo (src/lib/server/demo-seed.ts). */
export const demo = {
  team: 'team-riverbend',
  outsideTeam: 'team-northgate',
  study: 'study-riverbend-members-2027',
  /** The home-service study, seeded with version 1 of its cut list published (src/lib/server/demo-handoff.ts). */
  homeStudy: 'study-riverbend-home-service-2026',
  outsideStudy: 'study-northgate-transport',
} as const;

export function baseUrl(): string {
  return inject('baseUrl');
}

/** A client with a cookie jar (and optionally a bearer token), of the shared test server unless told another address. */
export class Client extends HttpClient {
  /** @param base the server's address (the shared test server by default). */
  constructor(base?: string) {
    super(base ?? baseUrl());
  }
}

/**
 * A client of the shared test server, signed in as a user.
 * @throws Error when the sign-in fails.
 */
export async function signedIn(email: string, password = demoPassword): Promise<Client> {
  const client = new Client();
  const response = await client.signIn(email, password);
  if (!signInSucceeded(response)) throw new Error(`sign-in as ${email} failed: ${response.status} ${response.headers.get('location')}`);
  return client;
}

/** Reads a JSON body. */
export async function body<T = any>(response: Response): Promise<T> {
  return (await response.json()) as T;
}

let counter = 0;
/** A unique e-mail address for a test. */
export function uniqueEmail(label: string): string {
  counter += 1;
  return `${label}-${Date.now().toString(36)}-${counter}@example.org`;
}

/**
 * Invites an address into a team as the given owner client and returns the token from the link
 * in the outbox e-mail.
 */
export async function inviteAndReadToken(owner: Client, teamId: string, email: string, role: string): Promise<string> {
  const created = await owner.post(`/api/teams/${teamId}/invitations`, { email, role });
  if (created.status !== 201) throw new Error(`invitation failed: ${created.status} ${await created.text()}`);
  const outbox = await body<{ mails: { to: string; text: string }[] }>(await owner.get('/api/outbox'));
  const mail = outbox.mails.find((m) => m.to === email.toLowerCase());
  if (!mail) throw new Error(`no invitation e-mail to ${email} in the outbox`);
  const match = /\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!match) throw new Error('the invitation e-mail has no link');
  return match[1];
}

/**
 * Creates a new member of a team through the real invitation flow.
 * @returns the new user's id and a signed-in client.
 */
export async function createMember(owner: Client, teamId: string, role: string): Promise<{ userId: string; email: string; client: Client }> {
  const email = uniqueEmail(role);
  const token = await inviteAndReadToken(owner, teamId, email, role);
  const anonymous = new Client();
  const accepted = await anonymous.post(`/api/invitations/${token}/accept`, { name: `Test ${role}`, password: 'a-long-test-password' });
  if (accepted.status !== 201) throw new Error(`accepting failed: ${accepted.status} ${await accepted.text()}`);
  const { userId } = await body<{ userId: string }>(accepted);
  return { userId, email, client: await signedIn(email, 'a-long-test-password') };
}

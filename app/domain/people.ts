import type { Role } from "./vocabulary";

/** Who did something, as the audit log and the signatures record it. */
export interface Actor {
  id: string;
  email: string;
  name?: string;
}

/** The signed-in person of a request: their session, account, organisation and roles in it. */
export interface CurrentUser {
  /** The session's id; `token:<id>` when the request came with a personal API token. */
  sessionId: string;
  user: { id: string; email: string; name: string };
  organisation: { id: string; name: string; slug: string };
  roles: Role[];
}

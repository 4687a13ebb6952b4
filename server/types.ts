import type { Role } from '../shared/roles';

export interface AuthContext {
  userId: string;
  sessionId: string;
  role: Role;
  unitIds: string[];
  name: string;
  email: string;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      auth?: AuthContext;
      /** Set by `validate`: the parsed body, query or params. */
      valid?: { body?: unknown; query?: unknown; params?: unknown };
    }
  }
}

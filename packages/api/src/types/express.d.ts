import type { SessionUser } from '../contract.ts';

declare global {
  namespace Express {
    // Passport's req.user is what the session keeps: the SessionUser of the contract.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

export {};

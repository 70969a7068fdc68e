import type { SessionUser } from '@loopwright/contract';

declare global {
  namespace Express {
    // Passport's req.user is what the session keeps: the SessionUser of the contract.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

export {};

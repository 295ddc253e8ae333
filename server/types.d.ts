// Request augmentation: the signed-in user as passport puts it on the request.
import type { SessionUser } from '../src/shared/schemas/auth';

declare global {
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}
export {};

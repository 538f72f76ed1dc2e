import type { User as UserModel } from '../models/user';
import type { ProjectRole } from '../models/enums';

declare global {
  namespace Express {
    // passport types req.user as Express.User; here that is the signed-in Eyrie user.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends UserModel {}
    interface Request {
      /** Set by authorizeProject once the caller's membership is known. */
      project?: { id: string; role: ProjectRole };
      /** How req.user was established: a browser session or a personal API token. */
      authMethod?: 'session' | 'token';
      /** The API token used, when authMethod is 'token'. */
      apiTokenId?: string;
    }
  }
}

export {};

import type { Role, UserRecord } from '../storage/store.ts';

/** A user as the API shows it: never the credential hash. */
export interface PublicUser {
  id: string;
  name: string;
  username: string;
  role: Role;
  unitId: string;
  active: boolean;
}

export function publicUser(user: UserRecord): PublicUser {
  return { id: user.id, name: user.name, username: user.username, role: user.role, unitId: user.unitId, active: user.active };
}

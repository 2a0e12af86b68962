import type { FieldDatabase } from "./db";

// This device's sync identity (shared/SYNC.md): the client group the server ties to the signed-in
// user, and the client whose mutation ids count up in the outbox. Made once, kept in meta.

export interface ClientIdentity {
  clientGroupId: string;
  clientId: string;
}

export const CLIENT_GROUP_ID = "clientGroupId";
export const CLIENT_ID = "clientId";

// Idempotent: the first call stores fresh UUIDs, every later call (any tab) reads the same ones.
export async function getClientIdentity(db: FieldDatabase): Promise<ClientIdentity> {
  return db.transaction("rw", db.meta, async () => {
    const group = (await db.meta.get(CLIENT_GROUP_ID))?.value as string | undefined;
    const client = (await db.meta.get(CLIENT_ID))?.value as string | undefined;
    const identity = {
      clientGroupId: group ?? crypto.randomUUID(),
      clientId: client ?? crypto.randomUUID(),
    };
    if (!group) await db.meta.put({ key: CLIENT_GROUP_ID, value: identity.clientGroupId });
    if (!client) await db.meta.put({ key: CLIENT_ID, value: identity.clientId });
    return identity;
  });
}

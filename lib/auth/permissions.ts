import type { Role } from "@/db/schema";

// The one place that decides who may read or change what. Route handlers, server actions and
// queries ask `can`; list queries narrow rows with the same rule (db/queries/access.ts).
//   rep        — reads and writes the records of the accounts they serve
//   grower     — reads their own account; writes only their comments and acknowledgements
//   supervisor — reads every account of their region; decides injury cases there
//   admin      — everything

export interface Actor {
  id: string;
  role: Role;
  regionId: string | null;
}

// What the server knows about the account a record belongs to, relative to the actor.
export interface AccountAccess {
  accountId: string;
  regionId: string;
  servedByActor: boolean;
  grownByActor: boolean;
}

export type Action = "read" | "write";

export type Resource =
  | { kind: "account" | "field" | "planting" | "fertilizerPass" | "digSite"; access: AccountAccess }
  | { kind: "case"; access: AccountAccess; sharedWithGrower: boolean }
  | { kind: "recommendationResponse"; access: AccountAccess }
  | { kind: "conflict"; regionId: string }
  | { kind: "product" }
  | { kind: "user"; regionId: string | null }
  | { kind: "region" };

export function inScope(actor: Actor, access: AccountAccess): boolean {
  switch (actor.role) {
    case "admin":
      return true;
    case "supervisor":
      return actor.regionId !== null && actor.regionId === access.regionId;
    case "rep":
      return access.servedByActor;
    case "grower":
      return access.grownByActor;
  }
}

export function can(actor: Actor, action: Action, resource: Resource): boolean {
  if (actor.role === "admin") return true;
  switch (resource.kind) {
    case "account":
      return action === "read" && inScope(actor, resource.access);
    case "field":
    case "planting":
    case "fertilizerPass":
    case "digSite":
      if (!inScope(actor, resource.access)) return false;
      return action === "read" || actor.role === "rep";
    case "case":
      if (!inScope(actor, resource.access)) return false;
      if (actor.role === "grower") return action === "read" && resource.sharedWithGrower;
      return action === "read" || actor.role === "supervisor";
    case "recommendationResponse":
      // The farm's grower acknowledges and comments on a dig's recommendation; the serving rep answers.
      if (!inScope(actor, resource.access)) return false;
      return action === "read" || actor.role === "grower" || actor.role === "rep";
    case "conflict":
      // Sync conflicts are listed and settled by the supervisor of the record's region.
      return actor.role === "supervisor" && actor.regionId === resource.regionId;
    case "product":
      return action === "read";
    case "user":
      return action === "read" && actor.role === "supervisor" && resource.regionId === actor.regionId;
    case "region":
      return action === "read" && actor.role !== "grower";
  }
}

// Read refusals answer 404 so ids of other farms reveal nothing; a record the actor may read but not
// change answers 403.
export function refusalStatus(actor: Actor, resource: Resource): 403 | 404 {
  return can(actor, "read", resource) ? 403 : 404;
}

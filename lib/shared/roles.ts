/** Team roles, weakest first. Shared by server code and client components (no server imports here). */
export type Role = "viewer" | "designer" | "lead";
export const ROLES: readonly Role[] = ["viewer", "designer", "lead"] as const;

const rank: Record<Role, number> = { viewer: 0, designer: 1, lead: 2 };

/** True when `role` grants at least what `min` grants (lead ⊃ designer ⊃ viewer). */
export function roleAtLeast(role: Role, min: Role): boolean {
  return rank[role] >= rank[min];
}

export function isRole(x: unknown): x is Role {
  return x === "viewer" || x === "designer" || x === "lead";
}

/** The signed-in user in the team they are working in. */
export interface CurrentUser {
  id: string;
  email: string;
  name: string;
  teamId: string;
  teamName: string;
  role: Role;
}

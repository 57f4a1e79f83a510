/**
 * Roles and the one capability map every server action and route handler consults.
 * Safe to import from client components (navigation uses it to decide what to show), but showing
 * or hiding a link is never the check: the server calls `can()` on every request.
 */
export const roles = ["technician", "qa-lead", "engineer", "admin"] as const;
export type Role = (typeof roles)[number];

export const roleLabels: Record<Role, string> = {
  technician: "Technician",
  "qa-lead": "QA lead",
  engineer: "Engineer",
  admin: "Administrator",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (roles as readonly string[]).includes(value);
}

const everyone = roles;

export const capabilities = {
  /** Read cell types, batches, cells, runs and their results. */
  "registry.read": everyone,
  "cell-type.write": ["engineer", "admin"],
  "batch.write": ["qa-lead", "engineer", "admin"],
  /** Register single cells; technicians do this at the bench when a new cell arrives. */
  "cell.write": everyone,
  /** Import a batch's serial list from CSV. */
  "cell.import": ["technician", "qa-lead", "engineer", "admin"],
  "user.manage": ["admin"],
  /** Read the audit trail: who changed what, when, with the values before and after. */
  "audit.read": ["qa-lead", "admin"],
  /** Upload bench logs (browser or bench API) and start their analysis. */
  "run.upload": ["technician", "engineer", "admin"],
  /** Analyse a stored run again, e.g. with a corrected column map (a new analysis version). */
  "run.analyse": ["technician", "engineer", "admin"],
  /** Read runs, their analyses, plots and raw files. */
  "run.read": everyone,
  /** Save named column maps from the upload page's correction. */
  "column-map.write": ["technician", "engineer", "admin"],
  /** Create and revoke one's own personal API tokens. */
  "token.manage": everyone,
} as const satisfies Record<string, readonly Role[]>;

export type Capability = keyof typeof capabilities;

export function can(role: Role | null | undefined, capability: Capability): boolean {
  if (!role) return false;
  return (capabilities[capability] as readonly Role[]).includes(role);
}

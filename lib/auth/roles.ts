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
  /**
   * Add notes to a run, and amend earlier ones (a new note; the original stays). Everyone who can
   * read a run may write in its notebook: technicians record what they saw at the bench, QA leads
   * and engineers their review.
   */
  "note.write": everyone,
  /** Save named column maps from the upload page's correction. */
  "column-map.write": ["technician", "engineer", "admin"],
  /** Create and revoke one's own personal API tokens. */
  "token.manage": everyone,
  /** See flags, their history, the fade and QA pages. Everyone: a technician should know a cell is flagged before testing it. */
  "flag.read": everyone,
  /** Configure flag rules and the lab's fade and alert settings (end-of-life threshold, daily digest). */
  "flag.rule.write": ["engineer", "admin"],
  /**
   * Raise a flag by hand and move flags through their states. Engineers only: a flag is an
   * engineering judgement on a cell. QA leads read flags next to a batch's figures and record
   * their own judgement as the lot decision.
   */
  "flag.raise": ["engineer"],
  "flag.transition": ["engineer"],
  /** Accept, reject or put a lot on hold. */
  "lot.decide": ["qa-lead"],
  /** See the link to the local mail catcher's inbox (development only). */
  "dev-inbox.view": ["engineer", "admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Capability = keyof typeof capabilities;

export function can(role: Role | null | undefined, capability: Capability): boolean {
  if (!role) return false;
  return (capabilities[capability] as readonly Role[]).includes(role);
}

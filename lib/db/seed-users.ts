import type { Role } from "@/lib/auth/roles";

/**
 * The demo scenario: Larkspur Pack Works, an invented small maker of battery packs, checks
 * incoming lots of cells before building packs. Every name, lot and serial here is made up.
 * Passwords are for local demos only; the README lists them.
 */
export const demoUsers: { name: string; email: string; password: string; role: Role }[] = [
  { name: "Tove Lindqvist", email: "tech@larkspur.test", password: "demo-technician-1", role: "technician" },
  { name: "Ravi Okonkwo", email: "qa@larkspur.test", password: "demo-qa-lead-1", role: "qa-lead" },
  { name: "Mirela Sand", email: "engineer@larkspur.test", password: "demo-engineer-1", role: "engineer" },
  { name: "Jonas Ekberg", email: "admin@larkspur.test", password: "demo-admin-1", role: "admin" },
];


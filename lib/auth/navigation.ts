import { can, type Capability, type Role } from "./roles";

export interface NavItem {
  href: string;
  label: string;
  capability: Capability;
}

/** The app shell's navigation; each entry appears only to roles that may use it. */
const items: NavItem[] = [
  { href: "/", label: "Start", capability: "registry.read" },
  { href: "/upload", label: "Upload", capability: "run.upload" },
  { href: "/cells", label: "Cells", capability: "registry.read" },
  { href: "/batches", label: "Batches", capability: "registry.read" },
  { href: "/flags", label: "Flags", capability: "flag.read" },
  { href: "/cell-types", label: "Cell types", capability: "registry.read" },
  { href: "/audit", label: "Audit trail", capability: "audit.read" },
  { href: "/admin/users", label: "People", capability: "user.manage" },
];

export function navigationFor(role: Role): NavItem[] {
  return items.filter((item) => can(role, item.capability));
}

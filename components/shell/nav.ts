import type { Role } from "@/db/schema";
import { may, type Permission } from "@/lib/auth/policy";

export interface NavItem {
  href: string;
  label: string;
  /** The permission the page asks for (lib/auth/policy.ts). */
  permission: Permission;
}

/** What each role may open, by the permission each page asks for; the pages check again. */
const NAV_ITEMS: readonly NavItem[] = [
  { href: "/board", label: "Bench board", permission: "see-board" },
  { href: "/jobs", label: "Jobs", permission: "list-jobs" },
  { href: "/customers", label: "Customers", permission: "read-customers" },
  { href: "/invoices", label: "Invoices", permission: "list-invoices" },
  { href: "/prices", label: "Prices", permission: "manage-prices" },
  { href: "/settings", label: "Shop settings", permission: "manage-settings" },
  { href: "/users", label: "Staff & access", permission: "manage-users" },
  { href: "/outbox", label: "Mail outbox", permission: "manage-mail" },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => may({ role }, item.permission));
}

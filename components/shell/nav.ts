import type { Role } from "@/db/schema";

export interface NavItem {
  href: string;
  label: string;
  roles: readonly Role[];
}

/** What each role may open; the pages check again on the server. */
export const NAV_ITEMS: readonly NavItem[] = [
  { href: "/board", label: "Bench board", roles: ["owner", "machinist", "counter"] },
  { href: "/jobs", label: "Jobs", roles: ["owner", "machinist", "counter", "customer"] },
  { href: "/customers", label: "Customers", roles: ["owner", "counter", "machinist"] },
  { href: "/invoices", label: "Invoices", roles: ["owner", "counter", "customer"] },
  { href: "/prices", label: "Prices", roles: ["owner"] },
  { href: "/settings", label: "Shop settings", roles: ["owner"] },
  { href: "/users", label: "Staff & access", roles: ["owner"] },
  { href: "/outbox", label: "Mail outbox", roles: ["owner"] },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.roles.includes(role));
}

"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import type { Role } from "@/db/schema";
import { may, type Permission } from "@/lib/auth/policy";

// The bench's screens are the shop's; a customer's job page has its own overview.
const SECTIONS: { path: string; label: string; permission?: Permission }[] = [
  { path: "", label: "Overview" },
  { path: "/weigh", label: "Scale", permission: "read-bench" },
  { path: "/plan", label: "Metal to remove", permission: "read-bench" },
  { path: "/bobweights", label: "Bobweights", permission: "read-bench" },
  { path: "/rotating", label: "Crank & rotating", permission: "read-bench" },
  { path: "/build", label: "Build" },
  { path: "/billing", label: "Billing", permission: "read-billing" },
];

export function JobTabs({ jobId, role }: { jobId: number; role: Role }) {
  const pathname = usePathname();
  const base = `/jobs/${jobId}`;
  return (
    <nav
      aria-label="Job sections"
      className="mb-6 flex flex-wrap gap-1 border-b border-graphite-200"
    >
      {SECTIONS.filter((s) => !s.permission || may({ role }, s.permission)).map((s) => {
        const href = base + s.path;
        const active = pathname === href;
        return (
          <Link
            key={s.path}
            href={href}
            aria-current={active ? "page" : undefined}
            className={`-mb-px border-b-2 px-3 py-2 text-sm font-semibold ${
              active
                ? "border-brass-500 text-graphite-900"
                : "border-transparent text-graphite-500 hover:text-graphite-800"
            }`}
          >
            {s.label}
          </Link>
        );
      })}
    </nav>
  );
}

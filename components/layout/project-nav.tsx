"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import type { NavItem } from "@/lib/navigation";

export function ProjectNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Project" className="border-b border-line bg-paper-raised">
      <ul className="mx-auto flex max-w-7xl flex-wrap gap-1 px-gutter">
        {items.map((item) => {
          const active = item.href === pathname || (!item.exact && pathname.startsWith(`${item.href}/`));
          return (
            <li key={item.href}>
              <Link
                href={item.href}
                aria-current={active ? "page" : undefined}
                className={`flex min-h-touch items-center border-b-4 px-4 font-semibold ${
                  active ? "border-accent text-accent-strong" : "border-transparent text-ink-soft hover:text-ink"
                }`}
              >
                {item.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}

"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";

/** Section links; the current section is marked with aria-current. */
export function NavLinks({ links }: { links: { href: string; label: string }[] }) {
  const pathname = usePathname() ?? "";
  return (
    <>
      {links.map((l) => (
        <Link key={l.href} href={l.href} aria-current={pathname === l.href || pathname.startsWith(l.href + "/") ? "page" : undefined}>
          {l.label}
        </Link>
      ))}
    </>
  );
}

import Link from "next/link";
import { NavLinks } from "./NavLinks";
import { SignOutButton } from "./SignOutButton";

interface TopBarUser {
  name: string;
  email: string;
  role: string;
}

/** Plain top bar: product name, main sections, the signed-in user and sign out. */
export function TopBar({ user }: { user: TopBarUser | null }) {
  const links = user
    ? [
        { href: "/arms", label: "Arms" },
        { href: "/requirements", label: "Requirement sets" },
        { href: "/shortlists", label: "Shortlists" },
        ...(user.role === "admin" ? [{ href: "/admin/users", label: "Users" }, { href: "/admin/audit", label: "Audit trail" }, { href: "/admin/system", label: "System" }] : []),
      ]
    : [];
  return (
    <header className="topbar">
      <div className="topbar-inner">
        <Link href={user ? "/arms" : "/signin"} className="brand">
          <img src="/icon.svg" alt="" width={22} height={22} />
          Armsift
        </Link>
        <nav aria-label="Main" className="nav">
          <NavLinks links={links} />
        </nav>
        <div className="who">
          {user ? (
            <>
              <span>
                Signed in as <Link href="/account" title="Your account: password and sessions"><strong>{user.name}</strong></Link> <span className="role-tag">{user.role}</span>
              </span>
              <SignOutButton />
            </>
          ) : (
            <>
              <Link href="/signin">Sign in</Link>
              <Link href="/signup">Sign up</Link>
            </>
          )}
        </div>
      </div>
    </header>
  );
}

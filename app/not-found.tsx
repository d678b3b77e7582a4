import Link from "next/link";

export default function NotFound() {
  return (
    <div className="panel narrow">
      <h1>Not found</h1>
      <p>There is nothing at this address. It may have been deleted, or the link is mistyped.</p>
      <p>
        <Link href="/arms">Arm catalog</Link> · <Link href="/requirements">Requirement sets</Link>
      </p>
    </div>
  );
}

"use client";

export default function ErrorPage({ error, retry }: { error: unknown; retry: () => void }) {
  const digest = error instanceof Error && "digest" in error ? String((error as Error & { digest?: string }).digest ?? "") : "";
  return (
    <div className="panel narrow" role="alert">
      <h1>Something went wrong</h1>
      <p>The page could not be shown. Your last saved data is unchanged.</p>
      {digest && (
        <p className="sub">
          Reference: <code>{digest}</code>
        </p>
      )}
      <div className="toolbar">
        <button type="button" className="primary" onClick={() => retry()}>
          Try again
        </button>
        <a className="button" href="/arms">
          Go to the arm catalog
        </a>
      </div>
    </div>
  );
}

"use client";
/**
 * The part of a 3-D view that every page loads: a button that opens the view. The view itself
 * (three.js and the scene code) is a separate chunk, fetched only when the button is pressed.
 * Without WebGL the frame says so and the page's tables and 2-D plots carry on unchanged.
 */
import { Suspense, useState, type ReactNode } from "react";
import { hasWebGL } from "./webgl";

/** The message shown instead of the view when WebGL is missing or fails. */
export function NoWebGL({ keeps }: { keeps: string }) {
  return (
    <p className="notice warn" role="status" data-testid="view3d-fallback">
      This browser cannot draw the 3-D view: WebGL is switched off or not available here. {keeps}
    </p>
  );
}

export function LazyViewFrame(props: {
  /** Names the view ("3-D view of the arm"). */
  title: string;
  /** What the page still offers without the view, for the fallback message. */
  keeps: string;
  /** The lazily loaded view, rendered only while open. */
  children: ReactNode;
  testId?: string;
}) {
  const [state, setState] = useState<"closed" | "open" | "no-webgl">("closed");
  return (
    <section className="view3d-frame no-print" aria-label={props.title} data-testid={props.testId ?? "view3d"} data-state={state}>
      <div className="toolbar">
        {state === "open" ? (
          <button type="button" onClick={() => setState("closed")} aria-expanded="true">
            Hide {props.title}
          </button>
        ) : (
          <button type="button" onClick={() => setState(hasWebGL() ? "open" : "no-webgl")} aria-expanded="false">
            Show {props.title}
          </button>
        )}
      </div>
      {state === "no-webgl" && <NoWebGL keeps={props.keeps} />}
      {state === "open" && (
        <Suspense fallback={<p className="sub" role="status">Loading the 3-D view…</p>}>{props.children}</Suspense>
      )}
    </section>
  );
}

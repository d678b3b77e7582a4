"use client";
/**
 * The canvas of a 3-D view with what every view shares: preset views, reset, a PNG screenshot,
 * the keyboard bindings listed on screen, units and the legend. Part of the lazily loaded chunk.
 */
import { useEffect, useRef, useState, type ReactNode } from "react";
import { KEY_HELP, PRESET_LABEL, Viewer, type PresetView } from "./engine";
import { bounds, contentPoints, gridStep, type SceneContent } from "./scene";
import { NoWebGL } from "./LazyViewFrame";
import { webglSupport } from "./webgl";
import "./view3d.css";
import { fixed } from "@/shared/format";

const PRESETS: PresetView[] = ["iso", "top", "front", "side"];

/** "100 mm" for a length in metres. */
export function mmText(m: number): string {
  const mm = m * 1000;
  const a = Math.abs(mm);
  const s = a >= 100 ? fixed(mm, 0) : a >= 0.05 ? fixed(mm, 1) : "0.0";
  return `${s === "-0" || s === "-0.0" ? s.slice(1) : s} mm`;
}

export function ViewShell(props: {
  content: SceneContent;
  /** When this changes the camera frames the content again (another arm, another cell). */
  frameKey: string;
  /** Screenshot file name without extension. */
  fileName: string;
  /** One line printed under the screenshot (what is shown, units, scales). */
  caption: string;
  /** Accessible name of the canvas region. */
  label: string;
  /** Legend entries specific to this view. */
  legend?: ReactNode;
  /** What the page still offers without the view. */
  keeps: string;
}) {
  const hostRef = useRef<HTMLDivElement>(null);
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const viewerRef = useRef<Viewer | null>(null);
  const framed = useRef<string | null>(null);
  const [failed, setFailed] = useState<string | null>(null);
  const [saving, setSaving] = useState<string | null>(null);
  const { content, frameKey } = props;

  useEffect(() => {
    const host = hostRef.current, canvas = canvasRef.current;
    if (!host || !canvas) return;
    let v: Viewer;
    try {
      v = new Viewer(host, canvas, { antialias: !webglSupport().software });
    } catch (e) {
      // Shown as the fallback message (the browser refused a WebGL 2 context).
      queueMicrotask(() => setFailed(e instanceof Error ? e.message : String(e)));
      return;
    }
    viewerRef.current = v;
    framed.current = null;
    return () => {
      v.dispose();
      viewerRef.current = null;
    };
  }, []);

  useEffect(() => {
    const v = viewerRef.current;
    if (!v) return;
    const frame = framed.current !== frameKey;
    framed.current = frameKey;
    v.setContent(content, { frame });
  }, [content, frameKey]);

  const step = gridStep(bounds(contentPoints(content)).size);

  const screenshot = async () => {
    const v = viewerRef.current;
    if (!v) return;
    setSaving("Making the PNG…");
    try {
      const blob = await v.screenshot(`${props.caption} Grid squares ${mmText(step)}.`);
      const url = URL.createObjectURL(blob);
      const a = document.createElement("a");
      a.href = url;
      a.download = `${props.fileName}.png`;
      document.body.appendChild(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      setSaving(null);
    } catch (e) {
      setSaving(`No screenshot: ${e instanceof Error ? e.message : String(e)}`);
    }
  };

  if (failed) return <NoWebGL keeps={props.keeps} />;
  return (
    <div className="v3" data-testid="view3d-open">
      <div className="toolbar v3-tools" role="toolbar" aria-label="View controls">
        {PRESETS.map((p) => (
          <button key={p} type="button" onClick={() => viewerRef.current?.view(p)}>
            {PRESET_LABEL[p]}
          </button>
        ))}
        <button type="button" onClick={() => viewerRef.current?.view("reset")}>
          Reset view
        </button>
        <button type="button" onClick={screenshot}>
          Save PNG
        </button>
        {saving && <span className="sub" role="status">{saving}</span>}
      </div>
      <div
        ref={hostRef}
        className="v3-host"
        tabIndex={0}
        role="application"
        aria-label={`${props.label}. Arrows orbit, Shift with arrows pans, plus and minus zoom, R resets the view.`}
        aria-describedby="v3-keys"
        data-testid="view3d-host"
        onKeyDown={(e) => {
          if (e.altKey || e.ctrlKey || e.metaKey) return;
          if (viewerRef.current?.handleKey(e.key, e.shiftKey)) e.preventDefault();
        }}
      >
        <canvas ref={canvasRef} data-testid="view3d-canvas" />
      </div>
      <div className="v3-notes">
        <ul className="v3-keys" id="v3-keys" aria-label="Keyboard controls (click or tab into the view first)">
          {KEY_HELP.map(([k, what]) => (
            <li key={k}>
              <kbd>{k}</kbd> {what}
            </li>
          ))}
          <li>Mouse or touch: drag to orbit, right-drag or two fingers to pan, wheel or pinch to zoom.</li>
        </ul>
        <ul className="v3-legend" aria-label="Legend">
          <li>
            Units: labels in mm, N and degrees; grid squares {mmText(step)} in the plane z = {mmText(content.floorZ ?? 0)}{content.floorZ ? " (the arm base height)" : ""}.
          </li>
          <li>
            Frames: <span className="sw x">x</span> <span className="sw y">y</span> <span className="sw z">z</span> axes, lettered at the origin and the tool point.
          </li>
          {props.legend}
        </ul>
      </div>
    </div>
  );
}

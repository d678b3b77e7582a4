"use client";
import { useSyncExternalStore } from "react";

const subscribe = () => () => undefined;

/**
 * False during server rendering and hydration, true afterwards. Charts draw only in the browser,
 * so the server sends a fixed-size placeholder instead of dozens of SVG charts (page time).
 */
export function useMounted(): boolean {
  return useSyncExternalStore(subscribe, () => true, () => false);
}

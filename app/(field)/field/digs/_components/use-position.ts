"use client";

import { useCallback, useRef, useState } from "react";

export type PositionState =
  | { status: "idle" }
  | { status: "locating" }
  | { status: "ok"; lat: number; lon: number; accuracyM: number }
  | { status: "denied" | "unavailable" | "timeout" | "unsupported" };

export type Fix = Extract<PositionState, { status: "ok" }>;

// The phone's position on request (never watched: one fix per tap saves the battery). GPS with no
// signal still works: satellites need no network.
export function usePosition() {
  const [state, setState] = useState<PositionState>({ status: "idle" });
  const inFlight = useRef<Promise<Fix | null> | null>(null);

  const locate = useCallback((): Promise<Fix | null> => {
    if (inFlight.current) return inFlight.current;
    if (typeof navigator === "undefined" || !navigator.geolocation) {
      setState({ status: "unsupported" });
      return Promise.resolve(null);
    }
    setState({ status: "locating" });
    const request = new Promise<Fix | null>((resolve) => {
      navigator.geolocation.getCurrentPosition(
        (pos) => {
          const fix: Fix = {
            status: "ok",
            lat: pos.coords.latitude,
            lon: pos.coords.longitude,
            accuracyM: pos.coords.accuracy,
          };
          setState(fix);
          resolve(fix);
        },
        (err) => {
          setState({
            status:
              err.code === err.PERMISSION_DENIED
                ? "denied"
                : err.code === err.TIMEOUT
                  ? "timeout"
                  : "unavailable",
          });
          resolve(null);
        },
        { enableHighAccuracy: true, timeout: 20_000, maximumAge: 30_000 },
      );
    }).finally(() => {
      inFlight.current = null;
    });
    inFlight.current = request;
    return request;
  }, []);

  return { state, locate };
}

"use client";

/**
 * The engine the tablet runs for its live numbers (lib/traverse/engine-input with the calc command's
 * validation), which is not part of the page's first load. It is fetched at once when `now` (the
 * draft holds something the server has not computed yet), else in an idle moment after the page has
 * loaded when `soon` (a traverse that can still be typed into). Nothing waits on it: typed values go
 * to the offline draft as usual, and the live numbers follow as soon as the engine is there, computed
 * from whatever the draft holds by then. Without network before it ever arrived, it is tried again
 * when the connection returns or when it is needed anew.
 */
import { useEffect, useState } from "react";
import { afterLoad, loadLiveEngine, type LiveEngine } from "./later-parts";

export function useLiveEngine({ soon, now }: { soon: boolean; now: boolean }): { engine: LiveEngine | null; failed: boolean } {
  // Already here when the technician comes from another traverse within the app.
  const [engine, setEngine] = useState<LiveEngine | null>(() => loadLiveEngine.loaded());
  const [failed, setFailed] = useState(false);
  const [attempt, setAttempt] = useState(0);

  useEffect(() => {
    if (engine) return;
    let live = true;
    const load = () =>
      void loadLiveEngine().then(
        (m) => {
          if (!live) return;
          setEngine(m);
          setFailed(false);
        },
        () => live && setFailed(true),
      );
    if (now) {
      load();
      return () => {
        live = false;
      };
    }
    if (!soon) return;
    const cancel = afterLoad(load);
    return () => {
      live = false;
      cancel();
    };
  }, [engine, soon, now, attempt]);

  useEffect(() => {
    if (!failed) return;
    const retry = () => setAttempt((a) => a + 1);
    window.addEventListener("online", retry);
    return () => window.removeEventListener("online", retry);
  }, [failed]);

  return { engine, failed };
}

"use client";

/**
 * A part of a screen that is not in the page's first load (its code is fetched after the page is up,
 * as the traverse screen's components/traverse/later-parts.ts does), drawn where it belongs once its
 * code is there; until then `loading` holds its place, on the server's page too. The server does not
 * draw the part itself: the browser would then have to keep that markup unchanged until the code
 * arrived, and any change of the screen around it before that would make React throw it away. When
 * the code cannot be fetched (no network before it ever arrived), `unavailable` says so, with a button
 * that reloads the page (what was typed is kept on the device; once the bundler has failed to fetch a
 * part, only a new page fetches it again).
 */
import { Component, lazy, Suspense, useSyncExternalStore, type ComponentType, type ReactNode } from "react";
import { buttonClasses } from "./button";

const noop = () => () => {};

/** A loader that can also say, without waiting, what it has already loaded (see components/traverse/later-parts.ts). */
export type PartLoader<M> = (() => Promise<M>) & { loaded?: () => M | null };

export function laterPart<M, P extends object>(load: PartLoader<M>, pick: (m: M) => ComponentType<P>, texts: { loading: string; unavailable: string }) {
  const Part = lazy(() => {
    // Already fetched (preloaded after the page came up): hand it over at once, so React draws the part
    // in the same render instead of showing `loading` for a moment.
    const ready = load.loaded?.();
    if (ready) {
      const part = { default: pick(ready) };
      return { then: (resolve: (m: typeof part) => void) => resolve(part) } as unknown as Promise<typeof part>;
    }
    return load().then((m) => ({ default: pick(m) }));
  });
  function LaterPart(props: P) {
    const mounted = useSyncExternalStore(noop, () => true, () => false);
    const placeholder = <p className="text-ink-soft">{texts.loading}</p>;
    if (!mounted) return placeholder;
    return (
      <PartBoundary unavailable={texts.unavailable}>
        <Suspense fallback={placeholder}>
          <Part {...props} />
        </Suspense>
      </PartBoundary>
    );
  }
  return LaterPart;
}

class PartBoundary extends Component<{ children: ReactNode; unavailable: string }, { failed: boolean }> {
  state = { failed: false };

  static getDerivedStateFromError(): { failed: boolean } {
    return { failed: true };
  }

  render() {
    if (!this.state.failed) return this.props.children;
    return (
      <div role="status" className="grid justify-items-start gap-2 rounded-card border border-dashed border-line-strong p-3 text-ink-soft">
        <p>{this.props.unavailable}</p>
        <button type="button" className={buttonClasses("secondary")} onClick={() => window.location.reload()}>
          Reload the page
        </button>
      </div>
    );
  }
}

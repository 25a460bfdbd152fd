import { useEffect } from "react";
import { useBlocker } from "react-router";

/**
 * Warns before leaving a form with unsaved changes: in-app navigation gets a confirmation bar,
 * closing or reloading the tab gets the browser's own prompt.
 */
export function UnsavedGuard({ dirty }: { dirty: boolean }) {
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && currentLocation.pathname !== nextLocation.pathname);
  useEffect(() => {
    if (!dirty) return;
    const onBeforeUnload = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener("beforeunload", onBeforeUnload);
    return () => window.removeEventListener("beforeunload", onBeforeUnload);
  }, [dirty]);
  if (blocker.state !== "blocked") return null;
  return (
    <div role="alertdialog" aria-label="Unsaved changes" className="fixed inset-x-0 bottom-0 z-50 flex items-center justify-center gap-4 border-t border-warn/40 bg-warn-soft px-4 py-3 text-sm text-warn">
      <span className="font-semibold">This step has unsaved changes. Leave without saving?</span>
      <button type="button" className="rounded border border-warn px-3 py-1 font-semibold" onClick={() => blocker.proceed()}>
        Leave
      </button>
      <button type="button" className="rounded bg-warn px-3 py-1 font-semibold text-white" onClick={() => blocker.reset()}>
        Stay
      </button>
    </div>
  );
}

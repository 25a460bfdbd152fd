import { isRouteErrorResponse } from "react-router";

/**
 * An error in words for its status, never a stack trace: shared by the root, the signed-in layout,
 * the case layout and every step page, each drawing it inside as much of its frame as still stands.
 */
export function ErrorPanel({ error }: { error: unknown }) {
  let title = "Something went wrong";
  let detail = "The request could not be completed. If it keeps happening, tell your administrator the time it happened.";
  let status = 500;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const message = typeof error.data === "object" && error.data && "message" in error.data ? String(error.data.message) : typeof error.data === "string" ? error.data : "";
    if (error.status === 404) {
      title = "Not found";
      detail = message || "There is no page at this address, or you have no access to it.";
    } else if (error.status === 403) {
      title = "Not allowed";
      detail = message || "Your role does not allow this.";
    } else if (error.status === 401) {
      title = "Sign-in needed";
      detail = message || "Sign in to continue.";
    } else if (error.status === 503) {
      title = "Temporarily unavailable";
      detail = message || detail;
    } else {
      title = `Error ${error.status}`;
      detail = message || error.statusText || detail;
    }
  }
  return (
    <div role="alert" className="mt-6 rounded border border-line bg-surface p-5">
      <h1 className="text-xl font-semibold">{title}</h1>
      <p className="mt-2 text-ink-muted">{detail}</p>
      <p className="mt-2 text-xs text-ink-muted">Status {status}</p>
    </div>
  );
}

import { StrictMode } from "react";
import { hydrateRoot } from "react-dom/client";
import { HydratedRouter } from "react-router/dom";

// React Router's default entry, but not inside startTransition: React renders a transition in
// slices of about 5 ms and lets the browser lay out and paint the half-hydrated page between them.
// Outside one, the page hydrates in one task, 70–100 ms sooner after DOMContentLoaded here
// (docs/benchmarks.md). Input that arrives meanwhile waits for that task, then reaches a live page.
hydrateRoot(
  document,
  <StrictMode>
    <HydratedRouter />
  </StrictMode>,
);

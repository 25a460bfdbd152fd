import { createContext, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import type { StepKey } from "~/domain/vocabulary";
import { getCaseStepStates, getCaseSteps, getCaseStepsOf, type StepMeta, type StepState } from "~/services/case-steps.server";
import { getCase } from "~/services/programmes.server";
import { readSession, type SessionState } from "./session.server";

/** What every loader and action is handed and passes on to the checks: its request and the context its middleware filled. */
export interface RequestScope {
  request: Request;
  context: Readonly<RouterContextProvider>;
}

type CaseRecord = NonNullable<Awaited<ReturnType<typeof getCase>>>;

/** The reads that several loaders of one page need, made once per request (see `requestReads`). */
interface RequestReads {
  session(): Promise<SessionState>;
  case(organisationId: string, caseId: string): Promise<CaseRecord | null>;
  steps(caseId: string): Promise<Record<StepKey, StepState>>;
  /** The named steps only (the whole read when this request already made it). */
  stepsOf<K extends StepKey>(caseId: string, keys: readonly K[]): Promise<Record<K, StepState>>;
  /** The steps' states without their data (header, step rail, overview); the whole read when this request already made it. */
  stepStates(caseId: string): Promise<Record<StepKey, StepMeta>>;
}

const readsContext = createContext<RequestReads>();

/**
 * The root's middleware: puts this request's reads into its context. React Router runs the root,
 * layout and page loaders of a request in parallel with one context, so what one of them reads the
 * others get. The reads are lazy (an API call with a token, or the health check, never reads a
 * session; a page without a case never reads one) and filtered by the organisation the caller
 * passes in, so no loader is spared its own check. A writing request reads afresh each time: its
 * loaders run after its action in the same request (a form posted without scripts) and must show
 * what the action changed.
 */
export const requestReads: MiddlewareFunction<Response> = ({ request, context }, next) => {
  const once = onceFor(request);
  context.set(readsContext, {
    session: () => once("session", () => readSession(request)),
    case: (organisationId, caseId) => once(`case:${organisationId}:${caseId}`, () => getCase(organisationId, caseId)),
    steps: (caseId) => once(`steps:${caseId}`, () => getCaseSteps(caseId)),
    stepsOf: (caseId, keys) => once.made<Record<StepKey, StepState>>(`steps:${caseId}`) ?? once(`steps:${caseId}:${keys.join()}`, () => getCaseStepsOf(caseId, keys)),
    stepStates: (caseId) => once.made<Record<StepKey, StepState>>(`steps:${caseId}`) ?? once(`step-states:${caseId}`, () => getCaseStepStates(caseId)),
  });
  return next();
};

/** This request's reads; fails loudly when the root middleware has not run (a loader called by hand). */
export function readsOf(scope: RequestScope): RequestReads {
  return scope.context.get(readsContext);
}

interface Once {
  <T>(key: string, read: () => Promise<T>): Promise<T>;
  /** The read this request has already made under the key, if any. */
  made<T>(key: string): Promise<T> | undefined;
}

function onceFor(request: Request): Once {
  if (request.method !== "GET" && request.method !== "HEAD") return Object.assign(<T>(_key: string, read: () => Promise<T>) => read(), { made: () => undefined });
  const reads = new Map<string, Promise<unknown>>();
  const once = <T>(key: string, read: () => Promise<T>) => {
    let pending = reads.get(key) as Promise<T> | undefined;
    if (!pending) {
      pending = read();
      reads.set(key, pending);
      // A failed read is not kept: another loader of the page may try again.
      pending.catch(() => reads.delete(key));
    }
    return pending;
  };
  return Object.assign(once, { made: <T>(key: string) => reads.get(key) as Promise<T> | undefined });
}

import { useNavigation } from "react-router";

/**
 * True from the moment the page posts a form until its data have been read again after the post.
 * React Router hands the page the action's answer as soon as the post returns, while the loaders
 * are still reading the new state: a "Saved as revision 3" shown then sits beside revision 2 in the
 * rail and the save bar, and whatever is typed then is replaced when the new revision arrives. So
 * forms stay disabled, and answers wait, until the page shows what the answer is about.
 */
export function useSaving(): boolean {
  const n = useNavigation();
  return n.state === "submitting" || (n.state === "loading" && n.formMethod !== undefined && n.formMethod.toUpperCase() !== "GET");
}

/** The action's answer once the page shows the data it answers for; nothing while a post is under way. */
export function useSettledAnswer<T>(answer: T | undefined): T | undefined {
  return useSaving() ? undefined : answer;
}

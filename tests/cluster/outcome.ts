/** One checked statement of the cluster tests. */
export type Outcome = { name: string; ok: boolean; detail?: string };

export const outcome = (name: string, ok: boolean, detail?: string): Outcome => ({
  name,
  ok,
  detail,
});

/**
 * For the fakes of unit specs: a store member the code under test must never call. Calling it throws, so a spec whose
 * code starts using it fails loudly instead of passing on a made-up answer.
 */
export async function notUsed(..._args: unknown[]): Promise<never> {
  throw new Error('not used');
}

/** The error a call fails with; fails the test when the call succeeds. */
// `any`: tests read the provider error's fields (code, param, statusCode) freely.
export async function caught(promise: Promise<unknown>): Promise<any> {
  try {
    await promise;
  } catch (error) {
    return error;
  }
  throw new Error('expected the call to fail');
}

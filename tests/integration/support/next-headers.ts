/**
 * Server actions read the session through next/headers; outside Next there is no request scope, so the tests stand
 * in for it: `jar` holds the sealed cookie of the actor under test (the same seal the browser sends) and
 * `nextHeaders` is the module the mock returns — `vi.mock("next/headers", async () => (await import(…)).nextHeaders)`.
 */
export const jar: { cookie?: string } = {};

export const nextHeaders = {
  cookies: async () => ({
    get: (name: string) => {
      const pair = jar.cookie?.split("=");
      return pair && pair[0] === name ? { name, value: pair.slice(1).join("=") } : undefined;
    },
    set: () => undefined,
    delete: () => undefined,
  }),
  headers: async () => new Headers({ host: "127.0.0.1:3999" }),
};

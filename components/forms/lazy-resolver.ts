import type { FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';

/**
 * Form checks without zod on the first page. The schemas are zod (the server checks the same
 * ones), but zod is about a seventh of the web build's JavaScript, and sign-in, My infants and
 * the flowsheet do not need it to draw. So a form names a loader for its schema; the validation
 * code arrives in its own chunk the first time the form is used (the resolver's `preload`, called
 * on focus or when a form opens, starts it earlier), and every check after that runs as before.
 */

export type Schemas = typeof import('./schemas');

let schemasModule: Promise<Schemas> | null = null;

/**
 * Fetch the validation code (one chunk: zod, the resolver and every form's schema). A failed
 * fetch is retried next call. Call it (and ignore the promise) on a tap that opens a form, so
 * the chunk is fetched and run while the next screen draws rather than under the nurse's first
 * key presses.
 */
export function loadSchemas(): Promise<Schemas> {
  schemasModule ??= import('./schemas').catch((err: unknown) => {
    schemasModule = null;
    throw err;
  });
  return schemasModule;
}

/** The message a form shows when its checks could not be fetched (the connection dropped first). */
export const VALIDATION_UNAVAILABLE = 'The form could not load its checks. Check the connection and try again; nothing was saved.';

export type LazyResolver<TValues extends FieldValues> = Resolver<TValues> & {
  /** Start loading the checks now (a form calls this when it opens or its first field takes focus). */
  preload: () => void;
};

/**
 * A react-hook-form resolver for the zod schema `pick` chooses from the loaded schemas. Until
 * they arrive each validation waits for them. If loading fails, the form gets a root error
 * (nothing is submitted) and the next attempt loads again.
 */
export function lazyZodResolver<TValues extends FieldValues>(pick: (schemas: Schemas) => z.ZodType<TValues, FieldValues>): LazyResolver<TValues> {
  let ready: Promise<Resolver<TValues>> | null = null;
  const loaded = () => {
    ready ??= loadSchemas().then((schemas) => schemas.zodResolver(pick(schemas)) as unknown as Resolver<TValues>);
    return ready;
  };
  const resolver: Resolver<TValues> = async (values, context, options) => {
    let check: Resolver<TValues>;
    try {
      check = await loaded();
    } catch {
      ready = null;
      return { values: {}, errors: { root: { type: 'unavailable', message: VALIDATION_UNAVAILABLE } } } as Awaited<ReturnType<Resolver<TValues>>>;
    }
    return check(values, context, options);
  };
  return Object.assign(resolver, {
    preload: () => {
      loaded().catch(() => {
        ready = null;
      });
    },
  });
}

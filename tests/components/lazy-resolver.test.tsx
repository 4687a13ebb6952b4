/** Forms load their zod checks on first use (components/forms/lazy-resolver.ts); the checks must be the same ones. */
import type { ResolverOptions } from 'react-hook-form';
import { lazyZodResolver, VALIDATION_UNAVAILABLE } from '@/components/forms/lazy-resolver';
import { signInSchema } from '@/shared/schemas/auth';

type SignIn = { email: string; password: string };
const options = { fields: {}, shouldUseNativeValidation: false } as ResolverOptions<SignIn>;

describe('lazyZodResolver', () => {
  it('runs the shared schema once it has loaded: the same messages as the server', async () => {
    const resolver = lazyZodResolver<SignIn>((m) => m.signInSchema);
    const bad = await resolver({ email: 'not-an-address', password: '' }, undefined, options);
    const direct = signInSchema.safeParse({ email: 'not-an-address', password: '' });
    expect(direct.success).toBe(false);
    expect(bad.errors.email?.message).toBe(direct.error!.issues.find((i) => i.path[0] === 'email')!.message);
    const good = await resolver({ email: 'nia.okafor@warmfold.test', password: 'warm-hands-at-night' }, undefined, options);
    expect(good.errors).toEqual({});
    expect(good.values).toEqual({ email: 'nia.okafor@warmfold.test', password: 'warm-hands-at-night' });
  });

  it('gives a root error, never a pass, when the checks cannot load, and tries again next time', async () => {
    let fail = true;
    const resolver = lazyZodResolver<SignIn>((m) => {
      if (fail) throw new Error('chunk failed to load');
      return m.signInSchema;
    });
    const first = await resolver({ email: 'nia.okafor@warmfold.test', password: 'warm-hands-at-night' }, undefined, options);
    expect(first.errors.root?.message).toBe(VALIDATION_UNAVAILABLE);
    expect(first.values).toEqual({});
    fail = false;
    const second = await resolver({ email: 'nia.okafor@warmfold.test', password: 'warm-hands-at-night' }, undefined, options);
    expect(second.errors).toEqual({});
  });
});

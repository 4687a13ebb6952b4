/**
 * Every zod schema the screens validate with, and the resolver that runs them: the one module
 * the web build loads for form checks. Kept as a single lazily imported module on purpose:
 * Metro moves a module that two lazy chunks share into the chunk every page loads first, so
 * separate `import()`s of separate schema files would put zod back on the first page.
 * Import it only through components/forms/lazy-resolver.ts (tests/shared/static-imports.test.ts
 * checks no screen imports it, or zod, statically).
 */
export { zodResolver } from '@hookform/resolvers/zod';
export { createUserSchema } from '@/shared/schemas/admin';
export { changePasswordSchema, linkPasswordSchema, requestResetSchema, signInSchema } from '@/shared/schemas/auth';
export { teachingNoteSchema } from '@/shared/schemas/review';
export { admitFormSchema, admitFormToInput, assignNurseSchema, dischargeInfantSchema } from '@/shared/schemas/unit';
export { unitSettingsFormSchema } from '@/components/admin-users/unit-settings-schema';
export { correctReadingFormSchema, readingFormResolverSchema } from '@/components/bedside/reading-form-schema';
export { startSessionFormSchema } from '@/components/bedside/skin-to-skin-schema';

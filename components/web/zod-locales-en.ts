/**
 * The web build's stand-in for zod's `locales` index (see metro.config.js): only the English
 * messages, which zod configures by default. The full index pulls all of zod's ~50 languages
 * into every page's first download (about 60 KiB gzip) because Metro keeps whole modules.
 * The server keeps the real index; the schemas and their messages are the same on both sides.
 */
export { default as en } from 'zod/v4/locales/en.js';

module.exports = function (api) {
  // Under Jest, `import()` becomes a deferred require(): Node's VM cannot run a real dynamic
  // import without a flag, and the forms load their checks with one (components/forms/lazy-resolver.ts).
  // Metro keeps `import()` as it is and splits a chunk there.
  const underJest = api.cache.invalidate(() => process.env.JEST_WORKER_ID !== undefined);
  return { presets: ['babel-preset-expo'], plugins: underJest ? ['babel-plugin-dynamic-import-node'] : [] };
};

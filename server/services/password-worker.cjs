// Runs in a worker thread (server/services/password-hash.ts): bcrypt's rounds take tens of
// milliseconds of CPU, which here block only this thread, never the server's event loop.
// Plain CommonJS so the same file runs under the built server, tsx and Jest.
const bcrypt = require('bcryptjs');

module.exports = function passwordTask(task) {
  if (task.op === 'hash') return bcrypt.hashSync(task.password, task.cost);
  return bcrypt.compareSync(task.password, task.hash);
};

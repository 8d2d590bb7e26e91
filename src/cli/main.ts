// Entry point of the `topoprobe` command (see program.ts for the verbs).
import { main } from './program.js';
import { EXIT } from './exit-codes.js';

// A reader that stops early (`topoprobe predict ... | head`) closes the pipe: that is not an error.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE') process.exit(process.exitCode ?? EXIT.ok);
    throw err;
  });
}

process.exitCode = await main(process.argv.slice(2));

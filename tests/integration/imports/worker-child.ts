/**
 * Runs the import worker in a process of its own on the SQLITE_FILE database and reports each
 * committed chunk on stdout, so a test can kill it mid-way (SIGKILL) and resume in another process.
 * Run: node --conditions=react-server --import tsx tests/integration/imports/worker-child.ts <chunkSize>
 */
import { runImportsToCompletion } from '@/lib/imports/worker';
import { closeDb } from '@/db/client';

const chunkSize = Number(process.argv[2] ?? 100);
await runImportsToCompletion({
  chunkSize,
  onChunk: ({ saved }) => {
    process.stdout.write(`chunk ${saved}\n`);
  },
});
process.stdout.write('done\n');
await closeDb();

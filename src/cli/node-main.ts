/**
 * The Node adapter of the command line: the only file of src/cli that touches node:*. It wires
 * process.argv, the file system and the standard streams into runCli and sets the exit code.
 * vite.cli.config.ts bundles it into dist-cli/chokepoint.mjs; bin/chokepoint.mjs runs that.
 */
import { readFile, stat, writeFile } from 'node:fs/promises';
import process from 'node:process';
import { version } from '../../package.json';
import { type CliIo, runCli } from './run-cli.ts';

/** Write to a stream; a reader that went away (`chokepoint sweep x | head`) is not an error. */
function writer(stream: NodeJS.WriteStream): (text: string) => void {
  let closed = false;
  stream.on('error', (error: NodeJS.ErrnoException) => {
    if (error.code === 'EPIPE') closed = true;
    else throw error;
  });
  return (text) => {
    if (!closed) stream.write(text);
  };
}

const io: CliIo = {
  readFile: async (path, maxBytes) => {
    if (maxBytes !== undefined) {
      const { size } = await stat(path);
      if (size > maxBytes) throw Object.assign(new Error(`${path} holds ${size} bytes`), { code: 'EFBIG', size });
    }
    return readFile(path);
  },
  writeTextFile: (path, text) => writeFile(path, text, 'utf8'),
  stdout: writer(process.stdout),
  stderr: writer(process.stderr),
  version,
};

process.exitCode = await runCli(process.argv.slice(2), io);

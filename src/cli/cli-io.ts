import { readFile } from 'node:fs/promises';

/** What a command may touch: stdin, stdout, stderr and files. Passed in so commands can be run and tested in-process. */
export interface CliIo {
  /** The whole of stdin as text. */
  readStdin(): Promise<string>;
  /** True when stdin is a terminal rather than a pipe or a file (nothing will arrive unless typed). */
  stdinIsTerminal: boolean;
  /** A text file's contents; rejects with the operating system's error when it cannot be read. */
  readTextFile(path: string): Promise<string>;
  writeOut(text: string): void;
  writeErr(text: string): void;
}

/** Exit codes of every command: 0 all good, 1 a verification check failed, 2 unusable input, 3 a fault in the program itself. */
export const exitCodes = { ok: 0, checkFailed: 1, badInput: 2, internalError: 3 } as const;

/** The real process's streams and file system. */
export function nodeCliIo(): CliIo {
  return {
    stdinIsTerminal: process.stdin.isTTY === true,
    async readStdin() {
      const chunks: Buffer[] = [];
      for await (const chunk of process.stdin) chunks.push(typeof chunk === 'string' ? Buffer.from(chunk) : (chunk as Buffer));
      return Buffer.concat(chunks).toString('utf8');
    },
    readTextFile: (path) => readFile(path, 'utf8'),
    writeOut: (text) => {
      process.stdout.write(text);
    },
    writeErr: (text) => {
      process.stderr.write(text);
    },
  };
}

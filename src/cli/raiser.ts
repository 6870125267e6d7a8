#!/usr/bin/env node
/** Executable entry: runs the command line and sets the exit code. */
import { main } from './main.js';

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});

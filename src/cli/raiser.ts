#!/usr/bin/env node
/** Executable entry: runs the command line and sets the exit code. */
import { relaunchUnderAddressLimit } from './address-space.js';
import { main } from './main.js';

const relaunched = relaunchUnderAddressLimit();
if (relaunched !== undefined) process.exitCode = relaunched;
else
  main(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });

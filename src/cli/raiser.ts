#!/usr/bin/env node
/** Executable entry: runs the command line and sets the exit code. */
import { main } from './main.js';

process.exitCode = main(process.argv.slice(2));

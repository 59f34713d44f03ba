#!/usr/bin/env node
// Thin launcher: the command-line tool is compiled from src/cli.ts into dist/.
import { main } from "../dist/cli.js";

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error) => {
    console.error(error);
    process.exitCode = 3;
  },
);

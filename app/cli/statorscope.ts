#!/usr/bin/env node
import { version } from '../../package.json';
import { runCli } from './runCli.js';

void runCli(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  version,
  stderrIsTty: process.stderr.isTTY === true,
}).then((code) => {
  process.exitCode = code;
});

#!/usr/bin/env node
import { version } from '../../package.json';
import { exitWhenDone } from './exitWhenDone.js';
import { runCli } from './runCli.js';

const stderr = (text: string): boolean => process.stderr.write(text);
exitWhenDone(
  runCli(process.argv.slice(2), {
    stdout: (text) => process.stdout.write(text),
    stderr,
    version,
    stderrIsTty: process.stderr.isTTY === true,
  }),
  stderr,
);

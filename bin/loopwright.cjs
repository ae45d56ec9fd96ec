#!/usr/bin/env node
'use strict';
// Entry of the `loopwright` command: runs the bundled CLI built by `npm run build`.
const path = require('node:path');
const fs = require('node:fs');
const bundle = path.join(__dirname, '..', 'dist', 'cli.cjs');
if (!fs.existsSync(bundle)) {
  process.stderr.write('loopwright: the command-line tool is not built yet; run `npm run build` (npm ci does it).\n');
  process.exit(2);
}
require(bundle);

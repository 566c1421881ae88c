#!/usr/bin/env node
'use strict';
require('../dist/main.js').run(process.argv.slice(2));

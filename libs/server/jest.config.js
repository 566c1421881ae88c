/** @type {import('jest').Config} */
module.exports = require('../../shared/jest.base.js').nestJestConfig(__dirname, { e2eTimeout: 30000 });

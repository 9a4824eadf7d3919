/**
 * Each test file of the unit project starts with its own empty data folder, removed at its end:
 * a service that writes files (uploads, certificates, keys) for a test that did not name a
 * folder must not write into the repository's data/, which the demo uses (one test did).
 * Tests that need a particular folder still set RANKSEAL_DATA_DIR themselves.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll } from 'vitest';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-test-data-'));
process.env.RANKSEAL_DATA_DIR = folder;
afterAll(() => rmSync(folder, { recursive: true, force: true }));

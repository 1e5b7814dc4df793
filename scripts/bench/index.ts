// Registry of bench modules; add yours here. A module that needs a built server should say so
// from skip() instead of failing, so `tsx scripts/bench.ts engine` runs without one.
import { api } from './api';
import { engine } from './engine';
import { importCsv5k } from './import-csv-5k';
import { load } from './load';
import { pdf } from './pdf';
import { requests } from './requests';
import { stallHealthP99 } from './stall-health-p99';
import { table } from './table';
import type { BenchModule } from './harness';

export const modules: BenchModule[] = [engine, api, requests, pdf, table, load, importCsv5k, stallHealthP99];

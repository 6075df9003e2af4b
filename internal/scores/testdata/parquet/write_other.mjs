// Writes other-writer.parquet with DuckDB (npm package @duckdb/node-api
// 1.5.6-r.1), a Parquet writer independent of the Go library that sill
// reads with. Run from a folder where `npm install @duckdb/node-api@1.5.6-r.1`
// was done:
//   node write_other.mjs /path/to/other-writer.parquet
// The rows are invented bearing-desk cases; other-writer.csv beside this
// script holds the same rows, written out by hand, and the test expects the
// same set from both. Row 8 has a null score.
import { DuckDBInstance } from "@duckdb/node-api";

const out = process.argv[2];
const instance = await DuckDBInstance.create(":memory:");
const db = await instance.connect();
await db.run(`
  CREATE TABLE cases (
    wagon VARCHAR, score DOUBLE, score_decimal DECIMAL(9, 4), score_float FLOAT,
    failed BOOLEAN, failed_int INTEGER, checks BIGINT, yard VARCHAR);
  INSERT INTO cases VALUES
    ('VF-1001', 0.91,  0.91,  0.91,  true,  1, 3, 'Halvermoor'),
    ('VF-1002', 0.12,  0.12,  0.12,  false, 0, 1, 'Coldmere'),
    ('VF-1003', 0.57,  0.57,  0.57,  false, 0, 2, 'Halvermoor'),
    ('VF-1004', 0.57,  0.57,  0.57,  true,  1, 2, 'Coldmere'),
    ('VF-1005', 0.003, 0.003, 0.003, false, 0, 0, 'Bellrow'),
    ('VF-1006', 0.75,  0.75,  0.75,  true,  1, 4, 'Bellrow'),
    ('VF-1007', 0.3333, 0.3333, 0.3333, false, 0, 1, 'Coldmere'),
    ('VF-1008', NULL,  NULL,  NULL,  false, 0, 1, 'Halvermoor'),
    ('VF-1009', 0.0625, 0.0625, 0.0625, true, 1, 2, 'Bellrow');
`);
await db.run(`COPY cases TO '${out.replaceAll("'", "''")}' (FORMAT parquet)`);

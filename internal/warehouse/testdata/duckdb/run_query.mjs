// Runs a counts query printed by `sill sql` on DuckDB (npm package
// @duckdb/node-api 1.5.6-r.1) over a small invented table with awkward
// names, and prints the counts table. Run from a folder where
// `npm install @duckdb/node-api@1.5.6-r.1` was done:
//   sill sql --table 'scored "cases"' --score 'p Fail' --label "it's failed" \
//     --segment yard --digits 3 --where "\"yard\" <> 'west'" > q.sql
//   node run_query.mjs q.sql
// README.md beside this file holds what it printed.
import { DuckDBInstance } from "@duckdb/node-api";
import { readFileSync } from "node:fs";
const instance = await DuckDBInstance.create(":memory:");
const db = await instance.connect();
await db.run(`CREATE TABLE "scored ""cases""" ("p Fail" DOUBLE, "it's failed" VARCHAR, yard VARCHAR);
INSERT INTO "scored ""cases""" VALUES (0.12345, '1', 'north'), (0.12351, ' Yes', 'north'), (0.5, 'no', 'east'), (0.9996, 'TRUE', 'west'), (0.4444, 'maybe', 'east'), (NULL, '0', 'east');`);
const reader = await db.runAndReadAll(readFileSync(process.argv[2], "utf8"));
console.log(reader.columnNames().join(","));
for (const row of reader.getRows()) console.log(row.map(String).join(","));

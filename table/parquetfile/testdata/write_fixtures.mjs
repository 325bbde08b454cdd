// write_fixtures.mjs writes the Parquet files the tests of package
// parquetfile read, with a general-purpose writer outside the project:
// apache-arrow (JavaScript) builds the tables and parquet-wasm (the Rust
// parquet crate compiled to WebAssembly) writes them. It also writes the
// same main table as CSV, and the values of the typed table as JSON, so the
// tests can compare what they read with what was written.
//
// The data are synthetic: a follow-up table of a made-up clinic, drawn
// from a fixed-seed generator below.
//
// Run it from a scratch directory (never inside the repository), where
// node finds the packages:
//
//   cd "$(mktemp -d)" && npm install apache-arrow@21.2.0 parquet-wasm@0.8.0
//   cp /path/to/table/parquetfile/testdata/write_fixtures.mjs .
//   node write_fixtures.mjs /path/to/table/parquetfile/testdata
//
// The versions used are written to versions.json beside the files.
import { readFileSync, writeFileSync, mkdirSync } from "node:fs";
import { join } from "node:path";
import * as arrow from "apache-arrow";
import { Table, WriterPropertiesBuilder, Compression, writeParquet } from "parquet-wasm";

const out = process.argv[2];
if (!out) throw new Error("usage: node write_fixtures.mjs OUTDIR");
const version = (p) => JSON.parse(readFileSync(join(process.cwd(), "node_modules", p, "package.json"))).version;

// A 32-bit linear congruential generator (Numerical Recipes constants).
let state = 20261202;
function next() {
  state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
  return state / 4294967296;
}
const pick = (xs) => xs[Math.floor(next() * xs.length)];

const n = 240;
const cols = { age: [], dose: [], treated: [], site: [], arm: [], relapse: [], smoker: [] };
for (let i = 0; i < n; i++) {
  const age = 30 + Math.floor(next() * 50);
  const dose = next() < 0.08 ? null : Math.round((1 + next() * 9 + age / 40) * 100) / 100;
  const treated = next() < 0.05 ? null : next() < 0.5;
  cols.age.push(age);
  cols.dose.push(dose);
  cols.treated.push(treated);
  cols.site.push(pick(["north", "south", "east"]));
  cols.arm.push(pick(["control", "drug", "placebo"]));
  cols.relapse.push(next() < (treated ? 0.3 : 0.5) ? 1n : 0n);
  cols.smoker.push(next() < 0.05 ? null : pick(["yes", "no", "no"]));
}

function tableOf(lo, hi) {
  const sl = (k) => cols[k].slice(lo, hi);
  return new arrow.Table({
    age: arrow.vectorFromArray(sl("age"), new arrow.Int32()),
    dose: arrow.vectorFromArray(sl("dose"), new arrow.Float64()),
    treated: arrow.vectorFromArray(sl("treated"), new arrow.Bool()),
    site: arrow.vectorFromArray(sl("site"), new arrow.Dictionary(new arrow.Utf8(), new arrow.Int32())),
    arm: arrow.vectorFromArray(sl("arm"), new arrow.Utf8()),
    relapse: arrow.vectorFromArray(sl("relapse"), new arrow.Int64()),
    smoker: arrow.vectorFromArray(sl("smoker"), new arrow.Utf8()),
  });
}

function write(path, t, rowGroup, compression) {
  const props = new WriterPropertiesBuilder()
    .setCompression(compression)
    .setMaxRowGroupSize(rowGroup)
    .setDictionaryEnabled(true)
    .build();
  const bytes = writeParquet(Table.fromIPCStream(arrow.tableToIPC(t, "stream")), props);
  writeFileSync(path, bytes);
}

// The main table: one file in three row groups, the same rows in three
// parts, and as CSV.
write(join(out, "clinic.parquet"), tableOf(0, n), 100, Compression.SNAPPY);
mkdirSync(join(out, "clinic-parts"), { recursive: true });
for (let p = 0; p < 3; p++) {
  write(join(out, "clinic-parts", `part-000${p}.parquet`), tableOf(80 * p, 80 * (p + 1)), 1000, Compression.ZSTD);
}
const names = Object.keys(cols);
const cell = (v) => (v === null ? "" : String(v));
let csv = names.join(",") + "\n";
for (let i = 0; i < n; i++) csv += names.map((k) => cell(cols[k][i])).join(",") + "\n";
writeFileSync(join(out, "clinic.csv"), csv);

// Logical types beyond the main table, with nulls, and their values.
const typed = {
  small: [3, -7, null, 12, 0, 5],
  unsigned: [4000000000, 1, 2, null, 7, 9],
  single: [0.5, 1.25, null, -2.75, 3, 100.125],
  large: [9007199254740993n, 1n, -5n, 2n, null, 0n],
  label: ["alpha", null, "beta", "alpha", "gamma", "beta"],
  flag: [true, false, null, true, true, false],
};
const typedTable = new arrow.Table({
  small: arrow.vectorFromArray(typed.small, new arrow.Int8()),
  unsigned: arrow.vectorFromArray(typed.unsigned, new arrow.Uint32()),
  single: arrow.vectorFromArray(typed.single, new arrow.Float32()),
  large: arrow.vectorFromArray(typed.large, new arrow.Int64()),
  label: arrow.vectorFromArray(typed.label, new arrow.LargeUtf8()),
  flag: arrow.vectorFromArray(typed.flag, new arrow.Bool()),
});
write(join(out, "typed.parquet"), typedTable, 1000, Compression.GZIP);
writeFileSync(join(out, "typed.json"),
  JSON.stringify(typed, (k, v) => (typeof v === "bigint" ? v.toString() : v), 1) + "\n");

// Columns the reader refuses: a date, and a list.
write(join(out, "date.parquet"), new arrow.Table({
  x: arrow.vectorFromArray([1.5, 2.5], new arrow.Float64()),
  visit: arrow.vectorFromArray([new Date(Date.UTC(2024, 0, 2)), new Date(Date.UTC(2024, 5, 30))], new arrow.DateDay()),
}), 1000, Compression.UNCOMPRESSED);
write(join(out, "list.parquet"), new arrow.Table({
  x: arrow.vectorFromArray([1.5, 2.5], new arrow.Float64()),
  doses: arrow.vectorFromArray([[1, 2], [3]], new arrow.List(new arrow.Field("item", new arrow.Float64(), true))),
}), 1000, Compression.UNCOMPRESSED);
// A column of numbers with one text cell, written as text: the mixed
// column the readers refuse.
const mixed = Array.from({ length: 120 }, (_, i) => String(i % 7 + 0.5));
mixed[57] = "-";
write(join(out, "mixed.parquet"), new arrow.Table({
  level: arrow.vectorFromArray(mixed, new arrow.Utf8()),
}), 1000, Compression.SNAPPY);

writeFileSync(join(out, "versions.json"), JSON.stringify({
  "apache-arrow": version("apache-arrow"),
  "parquet-wasm": version("parquet-wasm"),
  node: process.version,
}, null, 1) + "\n");

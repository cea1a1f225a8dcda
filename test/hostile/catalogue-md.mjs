// The tables of test/hostile-catalogue.md are written from test/hostile/catalogue.json
// (the one machine-readable list), so the two never disagree:
//   node test/hostile/catalogue-md.mjs     rewrites the tables in place
// test/hostile/catalogue.test.ts checks the committed file equals what this writes.
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const cell = (s) => String(s).replace(/\|/g, '\\|');

function rows(entries, first) {
  return entries.map((e, i) => `| ${first + i} | \`${e.id}\` | ${cell(e.input)} | ${cell(e.odd)} | ${cell(e.shows)} |`);
}

const HEAD = ['| # | id | input | what is odd | must produce |', '|---|---|---|---|---|'];

/** The markdown file with its two tables written from `catalogue`; the rest of `md` is kept. */
export function withTables(md, catalogue) {
  const data = [...HEAD, ...rows(catalogue.data, 1)].join('\n');
  const recipes = [...HEAD, ...rows(catalogue.recipes, catalogue.data.length + 1)].join('\n');
  const put = (text, name, table) => {
    const re = new RegExp(`(<!-- table:${name} -->\\n)[\\s\\S]*?(\\n<!-- end:${name} -->)`);
    if (!re.test(text)) throw new Error(`hostile-catalogue.md has no <!-- table:${name} --> … <!-- end:${name} --> markers`);
    return text.replace(re, `$1${table}$2`);
  };
  return put(put(md, 'data', data), 'recipes', recipes);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const root = fileURLToPath(new URL('../..', import.meta.url));
  const md = readFileSync(`${root}test/hostile-catalogue.md`, 'utf8');
  const catalogue = JSON.parse(readFileSync(`${root}test/hostile/catalogue.json`, 'utf8'));
  writeFileSync(`${root}test/hostile-catalogue.md`, withTables(md, catalogue));
  console.log(`wrote ${catalogue.data.length} data rows and ${catalogue.recipes.length} recipe rows`);
}

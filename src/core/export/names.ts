/**
 * File names of exports: the page's downloads, the batch ZIP's entries and
 * the command line's output files are all named from the input's name by
 * these rules, so the same input gives the same names everywhere.
 */

/** Longest name part kept (characters). */
const MAX_NAME = 80;

/**
 * Text reduced to characters safe in a file name on every common system:
 * letters, digits, underscore, dot, hyphen and space stay; every other run
 * becomes "_"; leading dots and spaces go; at most 80 characters. May be ''.
 */
export function exportSafeName(text: string): string {
  return String(text).replace(/[^\w.\- ]+/g, '_').replace(/^[.\s]+/, '').trim().slice(0, MAX_NAME);
}

/** The export name of an input file: its last path part without the extension, made safe ({@link exportSafeName}); "file" when nothing is left. */
export function zipBaseName(fileName: string): string {
  const last = String(fileName).split(/[\\/]/).pop() ?? '';
  const stem = last.replace(/\.[^.]*$/, '');
  return exportSafeName(stem) || 'file';
}

/**
 * A namer that hands out each name once per run: a name already given
 * (compared without regard to case, since common file systems ignore it)
 * gets "-2", "-3", … in the order of the calls.
 */
export function uniqueNamer(): (base: string) => string {
  const used = new Set<string>();
  return (base: string) => {
    let name = base;
    for (let k = 2; used.has(name.toLowerCase()); k++) name = `${base}-${k}`;
    used.add(name.toLowerCase());
    return name;
  };
}

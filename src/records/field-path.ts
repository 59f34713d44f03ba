/** Field paths as problems show them: `measurements[1].inputs.period`. */

export function childPath(parent: string, key: string): string {
  return parent === "" ? key : `${parent}.${key}`;
}

export function itemPath(parent: string, index: number): string {
  return `${parent}[${index}]`;
}

/** The enclosing path: "a.b[2]" → "a.b", "a.b" → "a", "a" → "". */
export function parentPath(path: string): string {
  const m = /^(.*?)(?:\.[^.[\]]*|\[\d+\])$/.exec(path);
  return m ? m[1] : "";
}

// Used by vite.config.ts on the built shell chunk (see the plugin lightkeel-compile-hints there).

/**
 * React, React DOM and the scheduler are CommonJS: the bundler wraps each module's body in an arrow function that runs
 * on its first require, and V8 compiles such a function lazily, on the main thread, when it is first called — for
 * React DOM a long task of its own at every first visit (the file-wide compile hint does not reach it). A function
 * *expression* in parentheses is one V8 compiles eagerly, while the file streams in, off the main thread (common
 * practice: the "PIFE" heuristic, which minifiers keep for this reason). So each wrapper `w(((a,b)=>{` becomes
 * `w((function(a,b){`: the same call, the same body (a module body uses neither `this` nor `arguments` at its top
 * level). `w` is found as the runtime's CommonJS helper, imported by the chunk, and only calls in the place of a
 * wrapper are changed: a declaration at the chunk's top (`var x=w(…` or `…)),x=w(…`), never a call of some other `w`
 * inside a function. If the shapes are not found, the chunk is left as it is and the build says so.
 */
export function eagerCommonJsWrappers(
  code: string,
  bundle: Record<string, { type: string; fileName: string; code?: string }>,
  warn: (message: string) => void,
): string {
  const runtime = Object.values(bundle).find((c) => c.type === 'chunk' && /rolldown-runtime/.test(c.fileName));
  // The helper: `h=(cb,mod)=>()=>(mod||(cb((mod={exports:{}}).exports,mod…` — its local name, then its exported name.
  const helper = runtime?.code?.match(/([\w$]+)=\(([\w$]+),([\w$]+)\)=>\(\)=>\(\3\|\|\(?\2\(\(\3=\{exports:\{\}\}\)/)?.[1];
  const exported = helper && runtime?.code?.match(new RegExp(`export\\{[^}]*\\b${helper.replaceAll('$', '\\$')} as ([\\w$]+)`))?.[1];
  const imports = code.match(/import\{([^}]*)\}from"\.\/rolldown-runtime[^"]*"/)?.[1] ?? '';
  const local = imports
    .split(',')
    .map((spec) => spec.split(' as '))
    .find(([name]) => name === exported)
    ?.at(-1);
  if (!local) {
    warn('shell: the CommonJS wrapper helper was not found; its wrappers stay lazily compiled');
    return code;
  }
  let count = 0;
  const wrapper = new RegExp(`((?:\\bvar |\\)\\),)[\\w$]+=)${local.replaceAll('$', '\\$')}\\(\\(\\(?([\\w$]+(?:,[\\w$]+)*)\\)?=>\\{`, 'g');
  const out = code.replace(wrapper, (_m, declared: string, params: string) => (count++, `${declared}${local}((function(${params}){`));
  if (count === 0) warn('shell: no CommonJS wrapper found to compile eagerly');
  return out;
}

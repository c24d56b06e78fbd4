import { Script } from 'node:vm';
import { describe, expect, it, vi } from 'vitest';
import { eagerCommonJsWrappers } from '../../scripts/lib/eager-cjs-wrappers';

// Shapes as the build writes them (copied from our own build output of the shell chunk and the bundler's runtime).
const runtime = {
  type: 'chunk',
  fileName: 'assets/rolldown-runtime-BWaJ3C7D.js',
  code:
    'var e=Object.create,o=(e,t,n)=>()=>{},s=(e,t)=>()=>(t||(e((t={exports:{}}).exports,t,t.exports),e=null),t.exports),' +
    'c=(e,n)=>{};export{u as a,d as i,o as n,c as r,s as t}',
};
const bundle = { runtime };
const shell =
  'import{a as e,t}from"./rolldown-runtime-BWaJ3C7D.js";var n=t((e=>{e.version=`19`})),r=t(((e,t)=>{t.exports=n()}));' +
  'function q(t){return t((e=>{this.x=e}))}var Vn=t((e=>{e.y=1})),Hn=t(((e,t)=>{t.exports=Vn()}));export{r as a}';

describe('the shell chunk: CommonJS wrappers compiled eagerly', () => {
  it('turns each wrapper declared at the top into a parenthesised function expression, and nothing else', () => {
    const warn = vi.fn();
    const out = eagerCommonJsWrappers(shell, bundle, warn);
    expect(out).toBe(
      'import{a as e,t}from"./rolldown-runtime-BWaJ3C7D.js";var n=t((function(e){e.version=`19`})),r=t((function(e,t){t.exports=n()}));' +
        'function q(t){return t((e=>{this.x=e}))}var Vn=t((function(e){e.y=1})),Hn=t((function(e,t){t.exports=Vn()}));export{r as a}',
    );
    expect(warn).not.toHaveBeenCalled();
    // Still code that parses (compiled, not run, without its import and export lines).
    expect(() => new Script(out.replace(/^import[^;]*;/, '').replace(/export\{[^}]*\}$/, ''))).not.toThrow();
  });

  it('follows the names the build chose for the helper', () => {
    const renamed = { ...runtime, code: runtime.code.replace('s as t', 's as k') };
    const out = eagerCommonJsWrappers(shell.replace('{a as e,t}', '{a as e,k as w}').replaceAll('=t((', '=w(('), { renamed }, vi.fn());
    expect(out.match(/=w\(\(function\(/g)).toHaveLength(4);
  });

  it('leaves the chunk as it is and says so when the helper is not where it is expected', () => {
    const warn = vi.fn();
    expect(eagerCommonJsWrappers(shell, {}, warn)).toBe(shell);
    expect(warn).toHaveBeenCalledWith(expect.stringContaining('not found'));
  });
});

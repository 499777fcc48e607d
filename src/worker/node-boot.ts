/**
 * The code a Node worker thread starts with: register tsx's ESM loader when
 * the module is TypeScript, then load it. (Passing `--import tsx` in a
 * worker's execArgv does not reach the worker's own entry module on Node 20:
 * "Unknown file extension .ts".)
 */
export function workerBootCode(moduleUrl: string): string {
  if (!/\.[cm]?ts$/.test(new URL(moduleUrl).pathname)) return `import(${JSON.stringify(moduleUrl)});`;
  const tsx = import.meta.resolve('tsx/esm/api');
  return `import(${JSON.stringify(tsx)}).then((api) => { api.register(); return import(${JSON.stringify(moduleUrl)}); });`;
}

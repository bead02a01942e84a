/**
 * Chromium flags that work headless and headed on these machines (toolchain notes). WebGL goes
 * through SwiftShader; never add --disable-software-rasterizer (WebGL then fails). Shared by the
 * e2e harness and the browser benchmark; no test-runner imports here, so the bench can use it.
 */
export const CHROMIUM_ARGS: readonly string[] = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--enable-unsafe-swiftshader',
  '--use-angle=swiftshader',
];

// Fixtures imported as text with Vite's `?raw` suffix (vitest runs the tests through Vite), so the
// engine's tests read them without Node's file system.
declare module '*.csv?raw' {
  const text: string;
  export default text;
}

/** A file bundled as a worker thread's script (server/build/thread-scripts.ts). */
declare module 'thread-script:*' {
  const source: string
  export default source
}

// Moved to src/lib/patch-view.ts (client-safe, read by server loads too). This re-export only keeps
// branches that were in flight during the move compiling; import `$lib/patch-view` instead.
export * from '../patch-view';

// Package atomicfile writes a file so that readers, and a process that is
// interrupted or crashes, see either the whole old file or the whole new
// one, never a part of either.
//
// The bytes go to a temporary file in the target's folder (so the final
// rename stays on one file system), which is flushed to the disk with
// fsync, closed and only then renamed over the target; the folder is synced
// too so the rename itself survives a power cut. On any error, including a
// cancelled context, the temporary file is removed and the target is left
// as it was.
package atomicfile

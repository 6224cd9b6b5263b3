#pragma once
// Output integrity. A regular file is written under a temporary name in the
// same directory and renamed over the target only when complete (rename(2) is
// atomic on POSIX file systems), so a killed run leaves either the old file or
// the complete new one, never a half-written one. What the target is decides
// the route (see resolve_output_target):
//   * a new path or an existing regular file: temp-and-rename; an existing
//     file keeps its permission bits (and owner, when allowed);
//   * a symbolic link: followed, the file it points to is replaced (the link
//     stays a link);
//   * a regular file with several hard links: the content is written in full
//     to the temporary first, then copied into the file in place on commit, so
//     every name keeps seeing the same file (a kill during the long
//     computation leaves the old content; only the final copy is not atomic);
//   * a FIFO, character device, socket, or anything under /dev/ or /proc/
//     (e.g. /dev/stdout, /dev/null, /dev/full): written through, never
//     replaced; a write error (ENOSPC on /dev/full) is a UserError;
//   * a directory: refused.
// Temporaries `<name>.tmp.<pid>` left behind by processes that no longer
// exist (a run killed by SIGKILL) are removed the next time the same target
// is written.
#include <fstream>
#include <memory>
#include <string>

namespace circlet {

enum class OutputRoute { Replace, CopyIntoHardLink, WriteThrough };

struct OutputTarget {
  OutputRoute route = OutputRoute::Replace;
  std::string path;  // the file finally written (symbolic links resolved for Replace/CopyIntoHardLink)
  bool exists = false;
  unsigned mode = 0;  // permission bits of an existing regular file
};

/// Decides how `path` is written (see the header comment); UserError for a
/// directory or an empty path.
OutputTarget resolve_output_target(const std::string& path);

/// Removes `<path>.tmp.<pid>` files in path's directory whose process is gone;
/// returns how many were removed.
int remove_stale_temporaries(const std::string& path);

class AtomicFile {
 public:
  /// Opens the temporary (or the target itself when written through); throws
  /// UserError if that is impossible.
  explicit AtomicFile(std::string path);
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;
  /// Removes the temporary file unless commit() succeeded.
  ~AtomicFile();
  std::ostream& stream() { return out_; }
  /// Flushes, fsyncs and renames over the target (or copies into it, or just
  /// flushes when written through). Throws UserError on I/O failure.
  void commit();
  const std::string& path() const { return path_; }
  OutputRoute route() const { return target_.route; }

 private:
  std::string path_;
  OutputTarget target_;
  std::string tmp_;
  std::ofstream out_;
  bool committed_ = false;
};

/// Where a command's output goes: standard output (path empty or "-"), or a
/// file written as AtomicFile does. Open it before a long computation so that
/// an unwritable path fails fast; call finish() when the output is complete.
class OutputSink {
 public:
  explicit OutputSink(const std::string& path);
  std::ostream& stream();
  /// True when the output goes to a named file (provenance comments are added then).
  bool to_file() const { return file_ != nullptr; }
  /// Commits the file, or flushes standard output; UserError when writing failed.
  void finish();

 private:
  std::unique_ptr<AtomicFile> file_;
};

/// Flushes standard output; UserError ("writing to standard output failed: …")
/// when any write to it failed (a full disk, /dev/full, a closed pipe).
void flush_standard_output();

/// Writes `content` to `path` as AtomicFile does.
void write_file_atomically(const std::string& path, const std::string& content);

/// Reads a whole file; throws UserError naming the file when it is missing or unreadable.
std::string read_file(const std::string& path);

}  // namespace circlet

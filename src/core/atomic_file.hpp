#pragma once
// Output integrity: a file is written under a temporary name in the same
// directory and renamed over the target only when complete (rename(2) is
// atomic on POSIX file systems), so a killed run leaves either the old file
// or the complete new one, never a half-written one.
#include <fstream>
#include <memory>
#include <string>

namespace circlet {

class AtomicFile {
 public:
  /// Opens `<path>.tmp.<pid>` for writing; throws UserError if that is impossible.
  explicit AtomicFile(std::string path);
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;
  /// Removes the temporary file unless commit() succeeded.
  ~AtomicFile();
  std::ostream& stream() { return out_; }
  /// Flushes, fsyncs and renames over the target. Throws UserError on I/O failure.
  void commit();
  const std::string& path() const { return path_; }

 private:
  std::string path_;
  std::string tmp_;
  std::ofstream out_;
  bool committed_ = false;
};

/// Where a command's output goes: standard output, or (path non-empty) a file
/// written atomically. Open it before a long computation so that an unwritable
/// path fails fast; call finish() when the output is complete.
class OutputSink {
 public:
  explicit OutputSink(const std::string& path);
  std::ostream& stream();
  bool to_file() const { return file_ != nullptr; }
  /// Commits the file, or flushes standard output; UserError when writing failed.
  void finish();

 private:
  std::unique_ptr<AtomicFile> file_;
};

/// Writes `content` to `path` atomically.
void write_file_atomically(const std::string& path, const std::string& content);

/// Reads a whole file; throws UserError naming the file when it is missing or unreadable.
std::string read_file(const std::string& path);

}  // namespace circlet

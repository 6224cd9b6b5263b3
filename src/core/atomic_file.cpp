#include "core/atomic_file.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <iostream>
#include <sstream>

#include "core/error.hpp"

namespace circlet {

AtomicFile::AtomicFile(std::string path) : path_(std::move(path)) {
  if (path_.empty()) throw UserError("output path is empty");
  tmp_ = path_ + ".tmp." + std::to_string(::getpid());
  out_.open(tmp_, std::ios::out | std::ios::trunc | std::ios::binary);
  if (!out_) throw UserError("cannot write '" + path_ + "': " + std::strerror(errno));
}

AtomicFile::~AtomicFile() {
  if (!committed_) {
    out_.close();
    std::remove(tmp_.c_str());
  }
}

void AtomicFile::commit() {
  out_.flush();
  if (!out_) throw UserError("writing '" + path_ + "' failed");
  out_.close();
  int fd = ::open(tmp_.c_str(), O_RDONLY);
  if (fd >= 0) {
    ::fsync(fd);
    ::close(fd);
  }
  if (std::rename(tmp_.c_str(), path_.c_str()) != 0)
    throw UserError("cannot rename '" + tmp_ + "' to '" + path_ + "': " + std::strerror(errno));
  committed_ = true;
}

OutputSink::OutputSink(const std::string& path) {
  if (!path.empty()) file_ = std::make_unique<AtomicFile>(path);
}

std::ostream& OutputSink::stream() { return file_ ? file_->stream() : std::cout; }

void OutputSink::finish() {
  if (file_) {
    file_->commit();
    return;
  }
  std::cout.flush();
  if (!std::cout) throw UserError("writing to standard output failed");
}

void write_file_atomically(const std::string& path, const std::string& content) {
  AtomicFile f(path);
  f.stream() << content;
  f.commit();
}

std::string read_file(const std::string& path) {
  struct stat st {};
  if (::stat(path.c_str(), &st) != 0) throw UserError("cannot read '" + path + "': " + std::strerror(errno));
  if (!S_ISREG(st.st_mode)) throw UserError("cannot read '" + path + "': not a regular file");
  std::ifstream in(path, std::ios::binary);
  if (!in) throw UserError("cannot read '" + path + "': " + std::strerror(errno));
  std::ostringstream ss;
  ss << in.rdbuf();
  if (in.bad()) throw UserError("reading '" + path + "' failed");
  return ss.str();
}

}  // namespace circlet

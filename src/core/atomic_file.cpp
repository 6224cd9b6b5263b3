#include "core/atomic_file.hpp"

#include <dirent.h>
#include <fcntl.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <iostream>
#include <sstream>
#include <vector>

#include "core/error.hpp"
#include "core/parse_int.hpp"

namespace circlet {

namespace {

std::string dir_of(const std::string& path) {
  const auto slash = path.find_last_of('/');
  if (slash == std::string::npos) return ".";
  return slash == 0 ? "/" : path.substr(0, slash);
}

std::string base_of(const std::string& path) {
  const auto slash = path.find_last_of('/');
  return slash == std::string::npos ? path : path.substr(slash + 1);
}

bool under_system_tree(const std::string& p) { return p.rfind("/dev/", 0) == 0 || p.rfind("/proc/", 0) == 0; }

[[noreturn]] void cannot_write(const std::string& path, int err) {
  throw UserError("cannot write '" + path + "': " + std::strerror(err));
}

/// Follows symbolic links by hand (also dangling ones, whose target is then
/// created); returns the final path. Gives up after 40 hops (ELOOP).
std::string follow_links(const std::string& path) {
  std::string p = path;
  for (int hop = 0; hop < 40; ++hop) {
    struct stat ls {};
    if (::lstat(p.c_str(), &ls) != 0 || !S_ISLNK(ls.st_mode)) return p;
    std::vector<char> buf(static_cast<size_t>(ls.st_size > 0 ? ls.st_size : 255) + 2);
    const ssize_t len = ::readlink(p.c_str(), buf.data(), buf.size() - 1);
    if (len < 0) cannot_write(path, errno);
    std::string target(buf.data(), static_cast<size_t>(len));
    p = (!target.empty() && target[0] == '/') ? target : dir_of(p) + "/" + target;
  }
  cannot_write(path, ELOOP);
}

}  // namespace

OutputTarget resolve_output_target(const std::string& path) {
  if (path.empty()) throw UserError("output path is empty");
  OutputTarget t;
  t.path = path;
  if (under_system_tree(path)) {  // /dev/stdout, /dev/null, /dev/full, /proc/self/fd/N: never replaced
    t.route = OutputRoute::WriteThrough;
    return t;
  }
  struct stat st {};
  if (::stat(path.c_str(), &st) == 0) {
    t.exists = true;
    if (S_ISDIR(st.st_mode)) cannot_write(path, EISDIR);
    if (!S_ISREG(st.st_mode)) {  // FIFO, character or block device, socket
      t.route = OutputRoute::WriteThrough;
      return t;
    }
    t.mode = st.st_mode & 07777;
    t.path = follow_links(path);
    if (under_system_tree(t.path)) {
      t.route = OutputRoute::WriteThrough;
      t.path = path;
      return t;
    }
    t.route = st.st_nlink > 1 ? OutputRoute::CopyIntoHardLink : OutputRoute::Replace;
    return t;
  }
  if (errno != ENOENT) cannot_write(path, errno);
  t.path = follow_links(path);  // a dangling link: its target is created
  if (under_system_tree(t.path)) {
    t.route = OutputRoute::WriteThrough;
    t.path = path;
  }
  return t;
}

int remove_stale_temporaries(const std::string& path) {
  const std::string dir = dir_of(path), prefix = base_of(path) + ".tmp.";
  DIR* d = ::opendir(dir.c_str());
  if (!d) return 0;
  int removed = 0;
  while (const dirent* e = ::readdir(d)) {
    const std::string name = e->d_name;
    if (name.rfind(prefix, 0) != 0) continue;
    const std::string pid_text = name.substr(prefix.size());
    if (!is_decimal_digits(pid_text) || pid_text.size() > 9) continue;
    const long pid = std::stol(pid_text);
    if (pid <= 0 || pid == ::getpid()) continue;
    // The process is gone (ESRCH): nobody will ever commit or remove this temporary.
    if (::kill(static_cast<pid_t>(pid), 0) == 0 || errno != ESRCH) continue;
    const std::string full = dir + "/" + name;
    struct stat ls {};
    if (::lstat(full.c_str(), &ls) == 0 && S_ISREG(ls.st_mode) && ::unlink(full.c_str()) == 0) ++removed;
  }
  ::closedir(d);
  return removed;
}

AtomicFile::AtomicFile(std::string path) : path_(std::move(path)), target_(resolve_output_target(path_)) {
  if (target_.route == OutputRoute::WriteThrough) {
    out_.open(target_.path, std::ios::out | std::ios::binary);
    if (!out_) cannot_write(path_, errno);
    return;
  }
  remove_stale_temporaries(target_.path);
  tmp_ = target_.path + ".tmp." + std::to_string(::getpid());
  out_.open(tmp_, std::ios::out | std::ios::trunc | std::ios::binary);
  if (!out_) cannot_write(path_, errno);
  if (target_.exists && target_.route == OutputRoute::Replace) {
    // Keep the permission bits (and, when allowed, the owner) of the file being replaced.
    struct stat st {};
    if (::stat(target_.path.c_str(), &st) == 0 && ::chown(tmp_.c_str(), st.st_uid, st.st_gid) != 0) {
      // not the owner: the new file belongs to us, as any newly written file would
    }
    ::chmod(tmp_.c_str(), target_.mode);
  }
}

AtomicFile::~AtomicFile() {
  if (!committed_) {
    out_.close();
    if (!tmp_.empty()) std::remove(tmp_.c_str());
  }
}

void AtomicFile::commit() {
  errno = 0;
  out_.flush();
  if (!out_) {
    const int err = errno;
    throw UserError("writing '" + path_ + "' failed" + (err ? std::string(": ") + std::strerror(err) : ""));
  }
  out_.close();
  if (out_.fail()) throw UserError("writing '" + path_ + "' failed" + (errno ? std::string(": ") + std::strerror(errno) : ""));
  if (target_.route == OutputRoute::WriteThrough) {
    committed_ = true;
    return;
  }
  int fd = ::open(tmp_.c_str(), O_RDONLY);
  if (fd >= 0) {
    ::fsync(fd);
    ::close(fd);
  }
  if (target_.route == OutputRoute::CopyIntoHardLink) {
    // Copy into the existing inode so that every hard link sees the new content.
    const int in = ::open(tmp_.c_str(), O_RDONLY);
    const int out = ::open(target_.path.c_str(), O_WRONLY | O_TRUNC);
    if (in < 0 || out < 0) {
      const int err = errno;
      if (in >= 0) ::close(in);
      if (out >= 0) ::close(out);
      cannot_write(path_, err);
    }
    char buf[1 << 16];
    for (;;) {
      const ssize_t got = ::read(in, buf, sizeof buf);
      if (got == 0) break;
      if (got < 0) {
        if (errno == EINTR) continue;
        const int err = errno;
        ::close(in), ::close(out);
        cannot_write(path_, err);
      }
      for (ssize_t done = 0; done < got;) {
        const ssize_t w = ::write(out, buf + done, static_cast<size_t>(got - done));
        if (w < 0) {
          if (errno == EINTR) continue;
          const int err = errno;
          ::close(in), ::close(out);
          cannot_write(path_, err);
        }
        done += w;
      }
    }
    ::close(in);
    const bool ok = ::fsync(out) == 0 || errno == EINVAL;
    const int err = errno;
    if (::close(out) != 0 || !ok) cannot_write(path_, err);
    std::remove(tmp_.c_str());
    committed_ = true;
    return;
  }
  if (std::rename(tmp_.c_str(), target_.path.c_str()) != 0)
    throw UserError("cannot rename '" + tmp_ + "' to '" + target_.path + "': " + std::strerror(errno));
  committed_ = true;
}

OutputSink::OutputSink(const std::string& path) {
  if (!path.empty() && path != "-") file_ = std::make_unique<AtomicFile>(path);
}

std::ostream& OutputSink::stream() { return file_ ? file_->stream() : std::cout; }

void OutputSink::finish() {
  if (file_) {
    file_->commit();
    return;
  }
  flush_standard_output();
}

void flush_standard_output() {
  errno = 0;
  std::cout.flush();
  const bool cout_ok = static_cast<bool>(std::cout);
  const bool c_ok = std::fflush(stdout) == 0 && !std::ferror(stdout);
  if (!cout_ok || !c_ok) {
    const int err = errno;
    std::cout.clear();
    throw UserError(std::string("writing to standard output failed") + (err ? std::string(": ") + std::strerror(err) : ""));
  }
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

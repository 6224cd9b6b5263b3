#include "scan/checkpoint.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <fstream>
#include <sstream>

#include "core/error.hpp"

namespace circlet {

namespace {
void write_all(int fd, const std::string& s, const std::string& path, bool sync) {
  size_t off = 0;
  while (off < s.size()) {
    ssize_t w = ::write(fd, s.data() + off, s.size() - off);
    if (w < 0) {
      if (errno == EINTR) continue;
      throw UserError("cannot write checkpoint " + path + ": " + std::strerror(errno));
    }
    off += static_cast<size_t>(w);
  }
  if (sync && ::fsync(fd) != 0) throw UserError("cannot fsync checkpoint " + path + ": " + std::strerror(errno));
}
}  // namespace

Checkpoint::Checkpoint(std::string path, const nlohmann::json& header, bool resume) : path_(std::move(path)) {
  struct stat st;
  bool exists = ::stat(path_.c_str(), &st) == 0;
  if (exists && !resume)
    throw UserError("checkpoint " + path_ + " already exists: pass --resume to continue that scan, or use a new directory");
  if (exists) {
    std::ifstream in(path_, std::ios::binary);
    std::string all((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    size_t pos = 0, good_end = 0;
    bool first = true;
    while (pos < all.size()) {
      size_t nl = all.find('\n', pos);
      if (nl == std::string::npos) break;  // torn last line: dropped
      std::string line = all.substr(pos, nl - pos);
      nlohmann::json j;
      try {
        j = nlohmann::json::parse(line);
      } catch (const nlohmann::json::exception&) {
        break;  // torn line: drop it and everything after (nothing follows a torn write)
      }
      if (first) {
        if (j != header)
          throw UserError("checkpoint " + path_ + " belongs to another scan (header " + j.dump() + ", this scan " +
                          header.dump() + ")");
        first = false;
      } else {
        if (!j.contains("job") || !j["job"].is_number_integer()) break;
        done_[j["job"].get<long>()] = j;
      }
      pos = nl + 1;
      good_end = pos;
    }
    if (first) good_end = 0;  // not even a header: start over
    if (::truncate(path_.c_str(), static_cast<off_t>(good_end)) != 0)
      throw UserError("cannot truncate checkpoint " + path_ + ": " + std::strerror(errno));
  }
  fd_ = ::open(path_.c_str(), O_WRONLY | O_CREAT | O_APPEND, 0644);
  if (fd_ < 0) throw UserError("cannot open checkpoint " + path_ + ": " + std::strerror(errno));
  off_t size = ::lseek(fd_, 0, SEEK_END);
  if (size == 0) write_all(fd_, header.dump() + "\n", path_, true);
  last_sync_ = std::chrono::steady_clock::now();
}

Checkpoint::~Checkpoint() {
  if (fd_ >= 0) {
    ::fsync(fd_);
    ::close(fd_);
  }
}

void Checkpoint::append(const nlohmann::json& record) {
  CIRCLET_ASSERT(record.contains("job") && record["job"].is_number_integer(), "checkpoint record without job");
  // One write(2) per record: once it returns, a killed process loses nothing. fsync
  // (against a crash of the machine) at most every 0.2 s, and in the destructor.
  auto now = std::chrono::steady_clock::now();
  bool sync = now - last_sync_ > std::chrono::milliseconds(200);
  write_all(fd_, record.dump() + "\n", path_, sync);
  if (sync) last_sync_ = now;
  done_[record["job"].get<long>()] = record;
}

}  // namespace circlet
